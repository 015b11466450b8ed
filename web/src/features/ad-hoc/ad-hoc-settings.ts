/**
 * Units and interval choices of the ad hoc comparison, decided here once: the default settings, the
 * preferred interval method that leads the results (one for rate ratios, one for risk differences),
 * and the interval each group's rate takes to match it. The page remembers the reader's choices on
 * this device (stored-settings.ts).
 */
export type Basis = 'person-years' | 'hours';
export type RatioMethod = 'exact' | 'midP' | 'wald';
export type DifferenceMethod = 'newcombe' | 'miettinenNurminen' | 'mee' | 'wald';

export interface AdHocSettings {
  basis: Basis;
  per: number;
  confidence: number;
  /** The rate-ratio interval that leads the rates results. */
  ratioMethod: RatioMethod;
  /** The risk-difference interval that leads the 2×2 results. */
  differenceMethod: DifferenceMethod;
}

export const defaultSettings: AdHocSettings = { basis: 'person-years', per: 1000, confidence: 0.95, ratioMethod: 'exact', differenceMethod: 'newcombe' };

export const perChoices: Record<Basis, { value: number; label: string }[]> = {
  'person-years': [
    { value: 1000, label: 'per 1,000 person-years' },
    { value: 10_000, label: 'per 10,000 person-years' },
    { value: 100_000, label: 'per 100,000 person-years' },
    { value: 1, label: 'per person-year' },
  ],
  hours: [
    { value: 200_000, label: 'per 200,000 hours worked (100 full-time workers for a year)' },
    { value: 1_000_000, label: 'per 1,000,000 hours worked' },
  ],
};

export const basisLabels: Record<Basis, string> = {
  'person-years': 'person-years, as entered',
  hours: 'hours worked, as entered',
};

export const ratioMethodLabels: Record<RatioMethod, string> = {
  exact: 'exact conditional',
  midP: 'mid-p exact',
  wald: 'Wald on the log scale',
};

export const differenceMethodLabels: Record<DifferenceMethod, string> = {
  newcombe: 'Newcombe hybrid score',
  miettinenNurminen: 'Miettinen–Nurminen score',
  mee: 'Mee score',
  wald: 'Wald',
};

/** Each group's rate takes the interval of the same family as the preferred rate-ratio interval. */
export const rateIntervalFor: Record<RatioMethod, 'exact' | 'midP' | 'byar'> = { exact: 'exact', midP: 'midP', wald: 'byar' };

/** The rate-ratio p-value that belongs with each preferred interval. */
export const ratioPFor: Record<RatioMethod, 'pExact' | 'pMidP' | 'pWald'> = { exact: 'pExact', midP: 'pMidP', wald: 'pWald' };

export function perLabel(settings: Pick<AdHocSettings, 'basis' | 'per'>): string {
  return perChoices[settings.basis].find((c) => c.value === settings.per)?.label ?? `per ${settings.per}`;
}

/** The short unit used in sentences: "per 1,000 person-years". */
export function perUnit(settings: Pick<AdHocSettings, 'basis' | 'per'>): string {
  const n = new Intl.NumberFormat('en-GB').format(settings.per);
  if (settings.basis === 'hours') return `per ${n} hours worked`;
  return settings.per === 1 ? 'per person-year' : `per ${n} person-years`;
}

/** Units and interval choices of the ad hoc comparison; the reader picks them, the strip shows them. */
export type Basis = 'person-years' | 'hours';
export type RatioMethod = 'exact' | 'midP' | 'wald';

export interface AdHocSettings {
  basis: Basis;
  per: number;
  confidence: number;
  ratioMethod: RatioMethod;
}

export const defaultSettings: AdHocSettings = { basis: 'person-years', per: 1000, confidence: 0.95, ratioMethod: 'exact' };

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

export function perLabel(settings: Pick<AdHocSettings, 'basis' | 'per'>): string {
  return perChoices[settings.basis].find((c) => c.value === settings.per)?.label ?? `per ${settings.per}`;
}

/** The short unit used in sentences: "per 1,000 person-years". */
export function perUnit(settings: Pick<AdHocSettings, 'basis' | 'per'>): string {
  const n = new Intl.NumberFormat('en-GB').format(settings.per);
  if (settings.basis === 'hours') return `per ${n} hours worked`;
  return settings.per === 1 ? 'per person-year' : `per ${n} person-years`;
}

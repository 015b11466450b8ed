/**
 * Score test for a linear trend in rates across ordered exposure levels (1 df), with the rate
 * of each level. With scores xⱼ, cases Oⱼ, person-time Tⱼ and Eⱼ = O₊Tⱼ/T₊:
 * χ² = [Σ xⱼ(Oⱼ − Eⱼ)]² / [Σ xⱼ²Eⱼ − (Σ xⱼEⱼ)²/O₊] (Breslow & Day 1987 Vol II, from memory in the
 * chapter comparing exposure groups); it equals the Poisson-regression score test for a
 * log-linear slope. Levels with no person-time are removed and reported.
 *
 * @example
 * rateTrend([{ score: 0, cases: 10, personTime: 1000 }, { score: 1, cases: 20, personTime: 1000 }])
 * // { chi2: 3.3333333333333335, df: 1, p: 0.06788915486182903, levels: [...], ... }
 */
import { chiSquareUpperTail } from './distributions';
import { incidenceRate, type IncidenceRateResult, type RateOptions, resolveRateOptions, validateRateGroup } from './incidence-rate';
import { METHODS } from './methods';
import { undefinedBecause, type Reason } from './result-types';
import { assertFinite, StatsValidationError } from './validation';

export interface TrendLevel {
  score: number;
  cases: number;
  personTime: number;
}

export interface RateTrendResult {
  chi2: number | null;
  df: 1;
  p: number | null;
  /** Signed score statistic U = Σ xⱼ(Oⱼ − Eⱼ): positive when rates rise with the score. */
  u: number | null;
  levels: Array<{ score: number; rate: IncidenceRateResult }>;
  droppedLevels: Array<{ index: number; reason: string }>;
  confidence: number;
  per: number;
  methods: { test: string; rate: string };
  reasons: Reason[];
}

/**
 * Trend score test in rates.
 *
 * @example
 * rateTrend([{ score: 0, cases: 0, personTime: 5 }, { score: 1, cases: 0, personTime: 5 }]).chi2 // null (no cases)
 */
export function rateTrend(levels: TrendLevel[], options: RateOptions = {}): RateTrendResult {
  if (!Array.isArray(levels) || levels.length < 2) throw new StatsValidationError([{ path: 'levels', message: 'must list at least two exposure levels' }]);
  levels.forEach((l, i) => {
    assertFinite(`levels[${i}].score`, l.score);
    validateRateGroup(`levels[${i}]`, l);
  });
  const { confidence, per } = resolveRateOptions(options);
  const reasons: Reason[] = [];
  const droppedLevels: RateTrendResult['droppedLevels'] = [];
  const used = levels.filter((l, index) => {
    if (l.personTime > 0) return true;
    droppedLevels.push({ index, reason: 'no person-time' });
    return false;
  });
  const base = {
    df: 1 as const,
    levels: levels.map((l) => ({ score: l.score, rate: incidenceRate(l, { confidence, per }) })),
    droppedLevels,
    confidence,
    per,
    methods: { test: METHODS.trend, rate: METHODS.rateExact },
  };
  const none = (why: string): RateTrendResult => {
    for (const f of ['chi2', 'p', 'u']) undefinedBecause(reasons, f, why);
    return { ...base, chi2: null, p: null, u: null, reasons };
  };
  if (used.length < 2) return none('fewer than two levels with person-time');
  const oTotal = used.reduce((s, l) => s + l.cases, 0);
  const tTotal = used.reduce((s, l) => s + l.personTime, 0);
  if (oTotal === 0) return none('no cases at any level');
  let u = 0;
  let sxxE = 0;
  let sxE = 0;
  for (const l of used) {
    const e = (oTotal * l.personTime) / tTotal; // Eⱼ = O₊Tⱼ/T₊
    u += l.score * (l.cases - e); // U = Σ xⱼ(Oⱼ − Eⱼ)
    sxxE += l.score * l.score * e;
    sxE += l.score * e;
  }
  const v = sxxE - (sxE * sxE) / oTotal; // V = Σ xⱼ²Eⱼ − (Σ xⱼEⱼ)²/O₊ (Breslow & Day 1987)
  // V is a weighted variance of the scores; it is 0 (up to rounding) only when all used scores are equal.
  const scores = new Set(used.map((l) => l.score));
  if (scores.size < 2 || !(v > 0)) return none('all levels with person-time have the same score');
  const chi2 = (u * u) / v;
  return { ...base, chi2, p: chiSquareUpperTail(chi2, 1), u, reasons };
}

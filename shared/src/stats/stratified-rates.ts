/**
 * Mantel–Haenszel analysis of person-time data over strata (age band × site × sex, …):
 * the MH rate ratio with the Greenland–Robins variance, the MH rate difference with its
 * variance, the MH chi-square test of IRR = 1, the score test of homogeneity under the common
 * MH rate ratio, and the crude comparison beside them.
 *
 * Strata handling (METHODS.md §4): a stratum with no person-time in one arm is dropped from every
 * adjusted measure; a stratum with no cases in either arm contributes nothing to the MH rate
 * ratio, its variance, the MH test or the homogeneity test and is left out of them, but it is
 * kept for the MH rate difference, where its weight T1T0/T is real information (a difference of 0).
 * Every stratum left out is reported with its index and reason.
 *
 * @example
 * stratifiedRates([
 *   { exposed: { cases: 1308, personTime: 4325264 }, reference: { cases: 884, personTime: 13142619 } },
 *   { exposed: { cases: 200, personTime: 1530342 }, reference: { cases: 190, personTime: 5586741 } },
 * ]).mhIrr // { estimate: 4.393244480716163, lower: 4.061988805977269, upper: 4.7515140954947865, p: 0, chi2: 1638.177537384984 }
 */
import { chiSquareUpperTail, twoSidedNormalP, zForConfidence } from './distributions';
import { compareRates, type RateComparisonResult } from './rate-comparison';
import { type RateGroup, type RateOptions, resolveRateOptions, validateRateGroup } from './incidence-rate';
import { METHODS } from './methods';
import { prefixReasons, undefinedBecause, type Reason } from './result-types';
import { StatsValidationError } from './validation';

export interface RateStratum {
  exposed: RateGroup;
  reference: RateGroup;
}

export interface DroppedStratum {
  index: number;
  reason: string;
  /** Measures the stratum is left out of. */
  excludedFrom: string[];
}

export interface ChiSquareTest {
  chi2: number | null;
  df: number | null;
  p: number | null;
}

export interface StratifiedRatesResult {
  /** Crude comparison over all supplied strata collapsed. */
  crude: RateComparisonResult;
  mhIrr: { estimate: number | null; lower: number | null; upper: number | null; p: number | null; chi2: number | null };
  mhIrd: { estimate: number | null; lower: number | null; upper: number | null };
  homogeneity: ChiSquareTest;
  strataUsed: { irr: number; ird: number };
  droppedStrata: DroppedStratum[];
  confidence: number;
  per: number;
  methods: { mhIrr: string; mhTest: string; mhIrd: string; homogeneity: string };
  reasons: Reason[];
}

/**
 * Mantel–Haenszel rate analysis.
 * IRR_MH = Σ aT0/T ÷ Σ bT1/T; Var ln IRR_MH = Σ M T1 T0/T² ÷ [(Σ aT0/T)(Σ bT1/T)] (Greenland & Robins 1985);
 * IRD_MH = Σ (aT0 − bT1)/T ÷ Σ w, w = T1T0/T, Var = Σ w²(a/T1² + b/T0²) ÷ (Σw)² (Greenland & Robins 1985);
 * χ²_MH = [Σ(a − E)]² / ΣV, E = M T1/T, V = M T1 T0/T² (Breslow & Day 1987 Vol II);
 * homogeneity Σ(a − Mp̂)²/(Mp̂(1 − p̂)), p̂ = IRR_MH·T1/(IRR_MH·T1 + T0), K − 1 df (Breslow & Day 1987 Vol II).
 *
 * @example
 * stratifiedRates([{ exposed: { cases: 0, personTime: 0 }, reference: { cases: 3, personTime: 10 } }]).droppedStrata
 * // [{ index: 0, reason: 'no person-time in the exposed arm', excludedFrom: ['mhIrr', 'mhIrd', 'homogeneity'] }]
 */
export function stratifiedRates(strata: RateStratum[], options: RateOptions = {}): StratifiedRatesResult {
  const adjusted = mantelHaenszelRates(strata, options);
  const total = (pick: (s: RateStratum) => number) => strata.reduce((acc, s) => acc + pick(s), 0);
  const crude = compareRates(
    { cases: total((s) => s.exposed.cases), personTime: total((s) => s.exposed.personTime) },
    { cases: total((s) => s.reference.cases), personTime: total((s) => s.reference.personTime) },
    { confidence: adjusted.confidence, per: adjusted.per },
  );
  return { crude, ...adjusted, reasons: [...prefixReasons('crude', crude.reasons), ...adjusted.reasons] };
}

/** The adjusted part of a Mantel–Haenszel analysis alone. */
export type MantelHaenszelRatesResult = Omit<StratifiedRatesResult, 'crude'>;

/**
 * The Mantel–Haenszel measures and tests of `stratifiedRates` without its crude comparison, for
 * a caller that already holds the crude figures (a run compares every group crude once and
 * adjusts it by three stratifications; the crude part costs far more than the adjustment).
 *
 * @example
 * mantelHaenszelRates([
 *   { exposed: { cases: 1308, personTime: 4325264 }, reference: { cases: 884, personTime: 13142619 } },
 *   { exposed: { cases: 200, personTime: 1530342 }, reference: { cases: 190, personTime: 5586741 } },
 * ]).mhIrr.estimate // 4.393244480716163
 */
export function mantelHaenszelRates(strata: RateStratum[], options: RateOptions = {}): MantelHaenszelRatesResult {
  if (!Array.isArray(strata) || strata.length === 0) throw new StatsValidationError([{ path: 'strata', message: 'must be a non-empty list of strata' }]);
  strata.forEach((s, i) => {
    validateRateGroup(`strata[${i}].exposed`, s.exposed);
    validateRateGroup(`strata[${i}].reference`, s.reference);
  });
  const { confidence, per } = resolveRateOptions(options);
  const reasons: Reason[] = [];
  const droppedStrata: DroppedStratum[] = [];

  const forIrd: RateStratum[] = [];
  const forIrr: RateStratum[] = [];
  strata.forEach((s, index) => {
    if (s.exposed.personTime === 0 || s.reference.personTime === 0) {
      const arm = s.exposed.personTime === 0 ? 'exposed' : 'reference';
      droppedStrata.push({ index, reason: `no person-time in the ${arm} arm`, excludedFrom: ['mhIrr', 'mhIrd', 'homogeneity'] });
      return;
    }
    forIrd.push(s);
    if (s.exposed.cases + s.reference.cases === 0) {
      droppedStrata.push({
        index,
        reason: 'no cases in either arm: contributes nothing to the MH rate ratio, its test or homogeneity',
        excludedFrom: ['mhIrr', 'homogeneity'],
      });
      return;
    }
    forIrr.push(s);
  });

  const z = zForConfidence(confidence);
  const mhIrr = mhRateRatio(forIrr, z, reasons);
  const mhIrd = mhRateDifference(forIrd, z, per, reasons);
  const homogeneity = rateHomogeneityScore(forIrr, mhIrr.estimate, reasons);
  return {
    mhIrr,
    mhIrd,
    homogeneity,
    strataUsed: { irr: forIrr.length, ird: forIrd.length },
    droppedStrata,
    confidence,
    per,
    methods: { mhIrr: METHODS.mhIrr, mhTest: METHODS.mhRateTest, mhIrd: METHODS.mhIrd, homogeneity: METHODS.rateHomogeneity },
    reasons,
  };
}

function mhRateRatio(strata: RateStratum[], z: number, reasons: Reason[]): StratifiedRatesResult['mhIrr'] {
  if (strata.length === 0) {
    const why = 'no stratum has person-time in both arms and at least one case';
    for (const f of ['estimate', 'lower', 'upper', 'p']) undefinedBecause(reasons, `mhIrr.${f}`, why);
    return { estimate: null, lower: null, upper: null, p: null, chi2: null };
  }
  let num = 0;
  let den = 0;
  let varNum = 0;
  let observedMinusExpected = 0;
  let variance = 0;
  for (const {
    exposed: { cases: a, personTime: t1 },
    reference: { cases: b, personTime: t0 },
  } of strata) {
    const t = t1 + t0;
    const m = a + b;
    num += (a * t0) / t; // Σ aT0/T (Greenland & Robins 1985)
    den += (b * t1) / t; // Σ bT1/T
    varNum += (m * t1 * t0) / (t * t); // Σ M T1 T0 / T² (Greenland & Robins 1985)
    observedMinusExpected += a - (m * t1) / t; // a − E, E = M T1/T
    variance += (m * t1 * t0) / (t * t); // V = M T1 T0/T²
  }
  const estimate = den === 0 ? Infinity : num / den;
  let lower: number | null = null;
  let upper: number | null = null;
  if (num === 0 || den === 0) {
    const why = num === 0 ? 'no exposed cases in any contributing stratum (log of 0)' : 'no reference cases in any contributing stratum (log of 0)';
    undefinedBecause(reasons, 'mhIrr.lower', why);
    undefinedBecause(reasons, 'mhIrr.upper', why);
  } else {
    const se = Math.sqrt(varNum / (num * den)); // Greenland–Robins SE of ln IRR_MH
    lower = estimate * Math.exp(-z * se);
    upper = estimate * Math.exp(z * se);
  }
  const chi2 = (observedMinusExpected * observedMinusExpected) / variance; // χ²_MH, 1 df
  const p = twoSidedNormalP(observedMinusExpected / Math.sqrt(variance));
  return { estimate, lower, upper, p, chi2 };
}

function mhRateDifference(strata: RateStratum[], z: number, per: number, reasons: Reason[]): StratifiedRatesResult['mhIrd'] {
  if (strata.length === 0) {
    const why = 'no stratum has person-time in both arms';
    for (const f of ['estimate', 'lower', 'upper']) undefinedBecause(reasons, `mhIrd.${f}`, why);
    return { estimate: null, lower: null, upper: null };
  }
  let num = 0;
  let sumW = 0;
  let varNum = 0;
  for (const {
    exposed: { cases: a, personTime: t1 },
    reference: { cases: b, personTime: t0 },
  } of strata) {
    const t = t1 + t0;
    const w = (t1 * t0) / t; // w = T1T0/T (Greenland & Robins 1985)
    num += (a * t0 - b * t1) / t; // Σ (aT0 − bT1)/T
    sumW += w;
    varNum += w * w * (a / (t1 * t1) + b / (t0 * t0)); // Σ w²(a/T1² + b/T0²)
  }
  const estimate = (num / sumW) * per;
  const se = (Math.sqrt(varNum) / sumW) * per;
  if (se === 0) {
    const why = 'no cases in any stratum: variance 0, not estimable';
    undefinedBecause(reasons, 'mhIrd.lower', why);
    undefinedBecause(reasons, 'mhIrd.upper', why);
    return { estimate, lower: null, upper: null };
  }
  return { estimate, lower: estimate - z * se, upper: estimate + z * se };
}

/**
 * Score test of homogeneity of the rate ratio under the common IRR_MH, over the strata that
 * contribute (both arms with person-time, at least one case), K − 1 df.
 * χ² = Σ (a − M p̂)² / (M p̂ (1 − p̂)), p̂ = IRR_MH T1/(IRR_MH T1 + T0) (Breslow & Day 1987 Vol II).
 *
 * @example
 * rateHomogeneityScore([
 *   { exposed: { cases: 1308, personTime: 4325264 }, reference: { cases: 884, personTime: 13142619 } },
 *   { exposed: { cases: 200, personTime: 1530342 }, reference: { cases: 190, personTime: 5586741 } },
 * ], 4.393244480716163, []) // { chi2: 2.0306655080287954, df: 1, p: 0.1541530925867363 }
 */
export function rateHomogeneityScore(strata: RateStratum[], commonIrr: number | null, reasons: Reason[]): ChiSquareTest {
  const none = (why: string): ChiSquareTest => {
    for (const f of ['chi2', 'df', 'p']) undefinedBecause(reasons, `homogeneity.${f}`, why);
    return { chi2: null, df: null, p: null };
  };
  if (strata.length < 2) return none('fewer than two contributing strata');
  if (commonIrr === null || commonIrr === 0 || commonIrr === Infinity) {
    return none('the common MH rate ratio is 0, infinite or undefined: expected counts are degenerate');
  }
  let chi2 = 0;
  for (const {
    exposed: { cases: a, personTime: t1 },
    reference: { cases: b, personTime: t0 },
  } of strata) {
    const m = a + b;
    const p = (commonIrr * t1) / (commonIrr * t1 + t0); // p̂ = IRR_MH T1/(IRR_MH T1 + T0)
    const e = m * p;
    chi2 += ((a - e) * (a - e)) / (e * (1 - p)); // (a − Mp̂)²/(Mp̂(1 − p̂))
  }
  const df = strata.length - 1;
  return { chi2, df, p: chiSquareUpperTail(chi2, df) };
}

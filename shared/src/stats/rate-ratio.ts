/**
 * Incidence rate ratio (IRR) of an exposed group (a cases in T1) versus a reference group
 * (b cases in T0): point estimate, Wald log-scale, exact conditional and mid-p intervals, and
 * the p-values for IRR = 1. Conditional on M = a + b, a ~ Bin(M, π) with
 * π = IRR·T1/(IRR·T1 + T0), so every exact statement about π maps to one about the IRR through
 * IRR = π/(1 − π) · T0/T1 (Breslow & Day 1987 Vol II; Rothman & Greenland 1998).
 *
 * @example
 * rateRatio({ cases: 41, personTime: 28010 }, { cases: 15, personTime: 19017 }).exact
 * // { lower: 1.0056840626892576, upper: 3.6093003110779023 }
 */
import { betaQuantile, binomialLowerTail, binomialPmf, binomialUpperTail, twoSidedNormalP, zForConfidence } from './distributions';
import { binomialPValues } from './binomial-tests';
import { METHODS } from './methods';
import { nullInterval, undefinedBecause, type Interval, type Reason } from './result-types';
import { increasingRoot } from './root-finding';
import { type RateGroup, validateRateGroup } from './incidence-rate';
import { assertConfidence } from './validation';
import { memoLimits } from './memo';

export interface RateRatioResult {
  estimate: number | null;
  wald: Interval;
  exact: Interval;
  midP: Interval;
  /** Exact conditional p, twice the smaller one-sided tail (consistent with `exact`). */
  pExact: number | null;
  /** Exact conditional p by the minimum-likelihood rule (as R poisson.test). */
  pExactMinLikelihood: number | null;
  pMidP: number | null;
  /** Wald z test on ln IRR. */
  pWald: number | null;
  /** Conditional score chi-square (1 df). */
  pScore: number | null;
  confidence: number;
  methods: {
    wald: string;
    exact: string;
    midP: string;
    pExact: string;
    pExactMinLikelihood: string;
    pMidP: string;
    pWald: string;
    pScore: string;
  };
  reasons: Reason[];
}

const logistic = (t: number): number => 1 / (1 + Math.exp(-t));

/**
 * Mid-p limits for the binomial proportion π of x successes in n, solved on the log-odds
 * scale (so the odds, and hence the IRR, keep full relative precision):
 * lower: P(X > x) + ½P(X = x) = α/2, upper: P(X < x) + ½P(X = x) = α/2.
 * Returns limits on the odds π/(1 − π): lower 0 when x = 0, upper ∞ when x = n.
 *
 * @example
 * binomialMidPOddsLimits(1, 2, 0.95) // { lower: 0.025641025641025633, upper: 39.00000000000027 }
 */
export const binomialMidPOddsLimits = memoLimits(function binomialMidPOddsLimits(x: number, n: number, confidence: number): { lower: number; upper: number } {
  const halfAlpha = (1 - confidence) / 2;
  const start = Math.log((x + 0.5) / (n - x + 0.5));
  // Lancaster 1961 mid-p; both tail sums are monotone in π, hence in t = logit π.
  const lowerEq = (t: number) => {
    const p = logistic(t);
    return binomialUpperTail(x + 1, n, p) + binomialPmf(x, n, p) / 2 - halfAlpha;
  };
  const upperEq = (t: number) => {
    const p = logistic(t);
    return halfAlpha - (binomialLowerTail(x - 1, n, p) + binomialPmf(x, n, p) / 2);
  };
  const lower = x === 0 ? 0 : Math.exp(increasingRoot(lowerEq, start));
  const upper = x === n ? Infinity : Math.exp(increasingRoot(upperEq, start));
  return { lower, upper };
});

/**
 * Clopper–Pearson limits for π = x/n expressed as odds π/(1 − π):
 * π_L = Beta⁻¹(α/2; x, n − x + 1), π_U = Beta⁻¹(1 − α/2; x + 1, n − x) (Clopper & Pearson 1934).
 *
 * @example
 * clopperPearsonOddsLimits(0, 5, 0.95) // { lower: 0, upper: 1.091279105182546 }
 */
export const clopperPearsonOddsLimits = memoLimits(function clopperPearsonOddsLimits(
  x: number,
  n: number,
  confidence: number,
): { lower: number; upper: number } {
  const alpha = 1 - confidence;
  const piL = x === 0 ? 0 : betaQuantile(alpha / 2, x, n - x + 1); // Clopper & Pearson 1934
  const piU = x === n ? 1 : betaQuantile(1 - alpha / 2, x + 1, n - x); // Clopper & Pearson 1934
  return { lower: piL / (1 - piL), upper: piU === 1 ? Infinity : piU / (1 - piU) };
});

/**
 * Rate ratio with all its intervals and tests. Zero counts follow METHODS.md §2: b = 0 < a gives
 * IRR = ∞, a = 0 < b gives 0, a = b = 0 leaves it undefined; the Wald interval and Wald p need
 * a, b > 0; the exact and mid-p intervals always exist (lower 0 when a = 0, upper ∞ when b = 0).
 *
 * @example
 * rateRatio({ cases: 5, personTime: 1000 }, { cases: 0, personTime: 2000 }, 0.95)
 * // { estimate: Infinity, wald: { lower: null, upper: null }, exact: { lower: 1.83271171463092, upper: Infinity }, ... }
 */
export function rateRatio(exposed: RateGroup, reference: RateGroup, confidence = 0.95): RateRatioResult {
  validateRateGroup('exposed', exposed);
  validateRateGroup('reference', reference);
  assertConfidence(confidence);
  const { cases: a, personTime: t1 } = exposed;
  const { cases: b, personTime: t0 } = reference;
  const methods = {
    wald: METHODS.irrWald,
    exact: METHODS.irrExact,
    midP: METHODS.irrMidP,
    pExact: METHODS.pExact,
    pExactMinLikelihood: METHODS.pExactMinLikelihood,
    pMidP: METHODS.pMidP,
    pWald: METHODS.pWald,
    pScore: METHODS.pScore,
  };
  const reasons: Reason[] = [];
  const empty = (why: string): RateRatioResult => {
    for (const f of ['estimate', 'wald', 'exact', 'midP', 'pExact', 'pExactMinLikelihood', 'pMidP', 'pWald', 'pScore']) {
      undefinedBecause(reasons, f, why);
    }
    const i = nullInterval;
    return {
      estimate: null,
      wald: i(),
      exact: i(),
      midP: i(),
      pExact: null,
      pExactMinLikelihood: null,
      pMidP: null,
      pWald: null,
      pScore: null,
      confidence,
      methods,
      reasons,
    };
  };
  // Guard clauses: a rate ratio needs person-time in both groups.
  if (t1 === 0) return empty('no person-time in the exposed group');
  if (t0 === 0) return empty('no person-time in the reference group');

  const m = a + b;
  const timeRatio = t0 / t1;
  let estimate: number | null;
  if (a === 0 && b === 0) estimate = undefinedBecause(reasons, 'estimate', 'no cases in either group');
  else if (b === 0)
    estimate = Infinity; // (a/T1)/(0/T0) with a > 0 (METHODS.md §2)
  else estimate = a / t1 / (b / t0); // IRR = (a/T1)/(b/T0)

  // Wald on the log scale: SE(ln IRR) = √(1/a + 1/b) (Rothman & Greenland 1998, ch. 14).
  let wald: Interval = nullInterval();
  let pWald: number | null = null;
  if (a === 0 || b === 0) {
    const why =
      a === 0 && b === 0 ? 'no cases in either group' : a === 0 ? 'no cases in the exposed group (log of 0)' : 'no cases in the reference group (log of 0)';
    undefinedBecause(reasons, 'wald', why);
    undefinedBecause(reasons, 'pWald', why);
  } else {
    const z = zForConfidence(confidence);
    const lnIrr = Math.log(estimate as number);
    const se = Math.sqrt(1 / a + 1 / b);
    wald = { lower: Math.exp(lnIrr - z * se), upper: Math.exp(lnIrr + z * se) };
    pWald = twoSidedNormalP(lnIrr / se); // z = ln IRR / SE
  }

  // Exact conditional: Clopper–Pearson for π, then IRR = π/(1−π)·T0/T1 (METHODS.md §2).
  const cp = clopperPearsonOddsLimits(a, m, confidence);
  const exact: Interval = m === 0 ? { lower: 0, upper: Infinity } : { lower: cp.lower * timeRatio, upper: cp.upper * timeRatio };
  const mid = m === 0 ? { lower: 0, upper: Infinity } : binomialMidPOddsLimits(a, m, confidence);
  const midP: Interval = { lower: mid.lower * timeRatio, upper: mid.upper * timeRatio };
  if (m === 0) reasons.push({ field: 'exact', reason: 'no cases in either group: the interval is uninformative (0 to Infinity)' });

  // Tests of IRR = 1: under H0, π0 = T1/T.
  const pi0 = t1 / (t1 + t0);
  const pv = binomialPValues(a, m, pi0);
  let pScore: number | null = null;
  if (m === 0) undefinedBecause(reasons, 'pScore', 'no cases in either group');
  else {
    // Conditional score χ² = (a − M·T1/T)² / (M·T1·T0/T²) (Breslow & Day 1987 Vol II).
    const e = m * pi0;
    const v = m * pi0 * (1 - pi0);
    pScore = twoSidedNormalP((a - e) / Math.sqrt(v));
  }
  return {
    estimate,
    wald,
    exact,
    midP,
    pExact: pv.pExact,
    pExactMinLikelihood: pv.pMinLikelihood,
    pMidP: pv.pMidP,
    pWald,
    pScore,
    confidence,
    methods,
    reasons,
  };
}

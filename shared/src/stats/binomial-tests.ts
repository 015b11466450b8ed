/**
 * Two-sided p-values for a binomial count, the basis of the exact conditional comparison of
 * two Poisson rates (exposed cases given the total are binomial).
 *
 * @example
 * binomialPValues(41, 56, 28010 / 47027)
 * // { lowerTail: 0.9883727016050208, upperTail: 0.023830123377282932, pExact: 0.047660246754565865,
 * //   pMidP: 0.03545742177226213, pMinLikelihood: 0.04085202628650178 }
 */
import { binomialLowerTail, binomialPmf, binomialUpperTail } from './distributions';

export interface BinomialPValues {
  /** P(X ≤ x). */
  lowerTail: number;
  /** P(X ≥ x). */
  upperTail: number;
  /** Twice the smaller one-sided tail, capped at 1 (consistent with the equal-tailed exact interval). */
  pExact: number;
  /** Twice the smaller one-sided mid-p tail, capped at 1. */
  pMidP: number;
  /** Minimum-likelihood two-sided p (sum of the probabilities not larger than that of x). */
  pMinLikelihood: number;
}

/**
 * Relative tolerance for "not larger than" in the minimum-likelihood rule, so that outcomes
 * tied in exact arithmetic stay tied in floating point (1 + 1e-7, as R's binom.test; from memory).
 */
export const MIN_LIKELIHOOD_RELATIVE_TOLERANCE = 1 + 1e-7;

/**
 * Largest index in [from, to] satisfying a predicate that holds on a prefix, by bisection;
 * returns from − 1 if none. Used on the monotone flank of a unimodal pmf.
 */
function lastTrue(from: number, to: number, pred: (i: number) => boolean): number {
  let lo = from - 1; // sentinel: treated as satisfying pred
  let hi = to + 1; // sentinel: treated as failing pred
  while (hi - lo > 1) {
    const mid = Math.floor((lo + hi) / 2);
    if (pred(mid)) lo = mid;
    else hi = mid;
  }
  return lo;
}

/**
 * Exact, mid-p and minimum-likelihood two-sided p-values of x ~ Bin(n, p) for H0: p = p0.
 * pExact = min(1, 2·min(P(X ≤ x), P(X ≥ x))); pMidP = min(1, 2·min(P(X < x) + ½P(X = x), P(X > x) + ½P(X = x)));
 * pMinLikelihood = Σ P(X = k) over k with P(X = k) ≤ P(X = x) (Clopper & Pearson 1934; Lancaster 1961 for mid-p).
 *
 * @example
 * binomialPValues(0, 5, 1 / 3).pExact // 0.2633744855967078
 */
export function binomialPValues(x: number, n: number, p0: number): BinomialPValues {
  const lowerTail = binomialLowerTail(x, n, p0);
  const upperTail = binomialUpperTail(x, n, p0);
  const pmf = binomialPmf(x, n, p0);
  const pExact = Math.min(1, 2 * Math.min(lowerTail, upperTail));
  const pMidP = Math.min(1, 2 * Math.min(lowerTail - pmf / 2, upperTail - pmf / 2));
  return { lowerTail, upperTail, pExact, pMidP, pMinLikelihood: binomialMinLikelihoodP(x, n, p0) };
}

/**
 * Minimum-likelihood two-sided binomial p-value (the rule of R's binom.test and scipy's
 * binomtest). The pmf is unimodal, so the outcomes on the far side that are no more likely
 * than x form one run, found by bisection.
 *
 * @example
 * binomialMinLikelihoodP(5, 5, 1 / 3) // 0.004115226337448558
 */
export function binomialMinLikelihoodP(x: number, n: number, p0: number): number {
  if (n === 0) return 1;
  const mean = n * p0;
  const d = binomialPmf(x, n, p0) * MIN_LIKELIHOOD_RELATIVE_TOLERANCE;
  if (x === mean) return 1;
  if (x < mean) {
    // Far side: k in [ceil(mean), n], where the pmf does not increase; count k with pmf ≤ d.
    const start = Math.ceil(mean);
    const firstSmall = lastTrue(start, n, (k) => binomialPmf(k, n, p0) > d) + 1;
    const far = firstSmall > n ? 0 : binomialUpperTail(firstSmall, n, p0);
    return Math.min(1, binomialLowerTail(x, n, p0) + far);
  }
  // Far side: k in [0, floor(mean)], where the pmf does not decrease.
  const end = Math.floor(mean);
  const lastSmall = lastTrue(0, end, (k) => binomialPmf(k, n, p0) <= d);
  const far = lastSmall < 0 ? 0 : binomialLowerTail(lastSmall, n, p0);
  return Math.min(1, binomialUpperTail(x, n, p0) + far);
}

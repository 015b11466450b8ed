/**
 * Distribution functions used by the statistics core, all taken from the maintained
 * stdlib numeric packages (never hand-written quantiles). Tail probabilities are computed
 * from the regularized incomplete gamma and beta functions directly, so that very small
 * p-values (1e-30 and below) keep their relative precision instead of being lost in `1 − cdf`.
 *
 * Identities used (standard, e.g. Abramowitz & Stegun 1964, 26.4.19 and 26.5.24):
 * - Poisson: P(X ≤ x; μ) = Q(x + 1, μ) and P(X ≥ x; μ) = P(x, μ) (regularized gamma).
 * - Binomial: P(X ≥ k; n, p) = I_p(k, n − k + 1) (regularized beta).
 * - Chi-square: P(X² ≥ q; k) = Q(k/2, q/2).
 *
 * stdlib's incomplete gamma is inaccurate for large shapes (see GAMMAINC_RELIABLE_SHAPE), so
 * Poisson tails for counts above 400 are summed from the pmf, and the exact Poisson limits are
 * polished on those tails (`poisson-limits.ts`).
 *
 * @example
 * chiSquareQuantile(0.975, 2) // 7.377758908227871
 */
import betaQuantileStdlib from '@stdlib/stats-base-dists-beta-quantile';
import chisquareQuantileStdlib from '@stdlib/stats-base-dists-chisquare-quantile';
import normalCdfStdlib from '@stdlib/stats-base-dists-normal-cdf';
import normalQuantileStdlib from '@stdlib/stats-base-dists-normal-quantile';
import binomialPmfStdlib from '@stdlib/stats-base-dists-binomial-pmf';
import poissonPmfStdlib from '@stdlib/stats-base-dists-poisson-pmf';
import poissonQuantileStdlib from '@stdlib/stats-base-dists-poisson-quantile';
import gammainc from '@stdlib/math-base-special-gammainc';
import betainc from '@stdlib/math-base-special-betainc';
import binomcoefln from '@stdlib/math-base-special-binomcoefln';

/** Standard normal quantile Φ⁻¹(p). @example normalQuantile(0.975) // 1.9599639845400538 */
export function normalQuantile(p: number): number {
  return normalQuantileStdlib(p, 0, 1);
}

/** Standard normal distribution function Φ(x). @example normalCdf(0) // 0.5 */
export function normalCdf(x: number): number {
  return normalCdfStdlib(x, 0, 1);
}

/**
 * Two-sided p-value of a standard normal statistic, 2Φ(−|z|).
 * @example twoSidedNormalP(1.959963984540054) // 0.05 (to 15 digits)
 */
export function twoSidedNormalP(z: number): number {
  return Math.min(1, 2 * normalCdf(-Math.abs(z)));
}

/** z_{1−α/2} for a two-sided interval at the given confidence. @example zForConfidence(0.95) // 1.9599639845400538 */
export function zForConfidence(confidence: number): number {
  return normalQuantile(1 - (1 - confidence) / 2);
}

/** Chi-square quantile with k degrees of freedom. @example chiSquareQuantile(0.975, 2) // 7.377758908227871 */
export function chiSquareQuantile(p: number, k: number): number {
  return chisquareQuantileStdlib(p, k);
}

/**
 * Upper tail P(X² ≥ q) of a chi-square with k degrees of freedom, Q(k/2, q/2).
 * @example chiSquareUpperTail(3.841458820694124, 1) // 0.05 (to 15 digits)
 */
export function chiSquareUpperTail(q: number, k: number): number {
  if (q <= 0) return 1;
  if (q === Infinity) return 0;
  return gammainc(q / 2, k / 2, true, true);
}

/** Beta quantile. @example betaQuantile(0.5, 1, 1) // 0.5 */
export function betaQuantile(p: number, a: number, b: number): number {
  return betaQuantileStdlib(p, a, b);
}

/** Binomial probability P(X = k). @example binomialPmf(1, 2, 0.5) // 0.5 */
export function binomialPmf(k: number, n: number, p: number): number {
  return binomialPmfStdlib(k, n, p);
}

/** Binomial lower tail P(X ≤ k; n, p). @example binomialLowerTail(0, 2, 0.5) // 0.25 */
export function binomialLowerTail(k: number, n: number, p: number): number {
  if (k < 0) return 0;
  if (k >= n) return 1;
  // P(X ≤ k) = 1 − I_p(k+1, n−k), taken as the upper regularized beta to keep precision.
  return betainc(p, k + 1, n - k, true, true);
}

/** Binomial upper tail P(X ≥ k; n, p). @example binomialUpperTail(2, 2, 0.5) // 0.25 */
export function binomialUpperTail(k: number, n: number, p: number): number {
  if (k <= 0) return 1;
  if (k > n) return 0;
  return betainc(p, k, n - k + 1, true, false);
}

/** Poisson probability P(X = x; μ). @example poissonPmf(0, 1) // 0.36787944117144233 */
export function poissonPmf(x: number, mu: number): number {
  return poissonPmfStdlib(x, mu);
}

/**
 * Shape above which stdlib's regularized incomplete gamma (0.3.1) is not used for Poisson tails:
 * checked against SciPy, it is accurate to 1e-15 up to shape 500 but off by up to 16% near the
 * mode at shape 1,000–20,000 (measured for this core). Above it the tails are summed from the
 * stdlib pmf instead, which is accurate to about 1e-11 relative there.
 */
export const GAMMAINC_RELIABLE_SHAPE = 400;

/**
 * P(X ≤ x; μ) by summing pmf terms from one stdlib pmf value with the ratio recurrence
 * p(k − 1) = p(k)·k/μ (or p(k + 1) = p(k)·μ/(k + 1) for the upper side), always summing the
 * tail that lies away from the mode so that small tails keep their relative precision.
 */
function poissonLowerTailBySummation(x: number, mu: number): number {
  if (x < mu) {
    let term = poissonPmfStdlib(x, mu);
    let sum = term;
    for (let k = x; k > 0; k--) {
      term *= k / mu;
      sum += term;
      if (term <= sum * 1e-17) break; // also stops when the tail underflows to 0
    }
    return Math.min(1, sum);
  }
  return Math.max(0, 1 - poissonUpperTailBySummation(x + 1, mu));
}

/** P(X ≥ x; μ) by summation, the counterpart of poissonLowerTailBySummation. */
function poissonUpperTailBySummation(x: number, mu: number): number {
  if (x > mu) {
    let term = poissonPmfStdlib(x, mu);
    let sum = term;
    for (let k = x + 1; ; k++) {
      term *= mu / k;
      sum += term;
      if (term <= sum * 1e-17) break; // also stops when the tail underflows to 0
    }
    return Math.min(1, sum);
  }
  return Math.max(0, 1 - poissonLowerTailBySummation(x - 1, mu));
}

/** Poisson lower tail P(X ≤ x; μ). @example poissonLowerTail(0, 1) // 0.36787944117144233 */
export function poissonLowerTail(x: number, mu: number): number {
  if (x < 0) return 0;
  if (mu === 0) return 1;
  if (x + 1 > GAMMAINC_RELIABLE_SHAPE) return poissonLowerTailBySummation(x, mu);
  return gammainc(mu, x + 1, true, true); // P(X ≤ x) = Q(x + 1, μ)
}

/** Poisson upper tail P(X ≥ x; μ). @example poissonUpperTail(1, 1) // 0.6321205588285577 */
export function poissonUpperTail(x: number, mu: number): number {
  if (x <= 0) return 1;
  if (mu === 0) return 0;
  if (x > GAMMAINC_RELIABLE_SHAPE) return poissonUpperTailBySummation(x, mu);
  return gammainc(mu, x, true, false); // P(X ≥ x) = P(x, μ)
}

/** Poisson quantile (smallest x with P(X ≤ x) ≥ p). @example poissonQuantile(0.5, 2) // 2 */
export function poissonQuantile(p: number, mu: number): number {
  return poissonQuantileStdlib(p, mu);
}

/** Natural log of the binomial coefficient C(n, k). @example logChoose(4, 2) // 1.7917594692280552 */
export function logChoose(n: number, k: number): number {
  return binomcoefln(n, k);
}

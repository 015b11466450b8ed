/**
 * Confidence limits for the mean μ of a Poisson count x. These are the building blocks of
 * the single-group rate (divide by person-time) and the SIR (divide by the expected count).
 *
 * @example
 * poissonExactLimits(10, 0.95) // { lower: 4.795388696132435, upper: 18.39035604201778 }
 */
import { chiSquareQuantile, GAMMAINC_RELIABLE_SHAPE, poissonLowerTail, poissonPmf, poissonUpperTail, zForConfidence } from './distributions';
import { brentRoot, increasingRoot } from './root-finding';
import { assertConfidence, assertCount } from './validation';
import { memoLimits } from './memo';

/** Limits of a Poisson mean; the exact limits always exist (upper is finite for finite x). */
export interface PoissonLimits {
  lower: number;
  upper: number;
}

/**
 * Exact (Garwood) limits for a Poisson mean.
 * lower = χ²_{α/2}(2x)/2 (0 when x = 0), upper = χ²_{1−α/2}(2x + 2)/2.
 *
 * @example
 * poissonExactLimits(0, 0.95) // { lower: 0, upper: 3.6888794541139354 }
 */
export const poissonExactLimits = memoLimits(function poissonExactLimits(count: number, confidence: number): PoissonLimits {
  assertCount('count', count);
  assertConfidence(confidence);
  const alpha = 1 - confidence;
  // Garwood F. Biometrika 1936;28:437–42: limits as chi-square quantiles.
  let lower = count === 0 ? 0 : chiSquareQuantile(alpha / 2, 2 * count) / 2;
  let upper = chiSquareQuantile(1 - alpha / 2, 2 * count + 2) / 2; // Garwood 1936
  if (count + 1 > GAMMAINC_RELIABLE_SHAPE) {
    // The stdlib chi-square quantile inherits the incomplete-gamma error at large shapes; solve
    // the defining tail equations P(X ≥ x; μ_L) = α/2 and P(X ≤ x; μ_U) = α/2 on accurate tails,
    // starting from the stdlib quantiles (on the log scale, so the solution keeps relative precision).
    const polish = (eq: (mu: number) => number, start: number) => Math.exp(increasingRoot((t) => eq(Math.exp(t)), Math.log(start), 1e-3));
    lower = polish((mu) => poissonUpperTail(count, mu) - alpha / 2, lower);
    upper = polish((mu) => alpha / 2 - poissonLowerTail(count, mu), upper);
  }
  return { lower, upper };
});

/**
 * Mid-p exact limits for a Poisson mean, solving
 * lower: P(X > x) + ½P(X = x) = α/2 and upper: P(X < x) + ½P(X = x) = α/2.
 * The mid-p limits lie inside the exact limits, which therefore bracket the roots.
 *
 * @example
 * poissonMidPLimits(0, 0.95) // { lower: 0, upper: 2.99573227355399 }  (= −ln 0.05)
 */
export const poissonMidPLimits = memoLimits(function poissonMidPLimits(count: number, confidence: number): PoissonLimits {
  assertCount('count', count);
  assertConfidence(confidence);
  const halfAlpha = (1 - confidence) / 2;
  const exact = poissonExactLimits(count, confidence);
  // Lancaster HO. J Am Stat Assoc 1961;56:223–34 (mid-p); the equations as in METHODS.md §1.
  const lowerEq = (mu: number) => poissonUpperTail(count + 1, mu) + poissonPmf(count, mu) / 2 - halfAlpha;
  const upperEq = (mu: number) => poissonLowerTail(count - 1, mu) + poissonPmf(count, mu) / 2 - halfAlpha;
  const lower = count === 0 ? 0 : brentRoot(lowerEq, exact.lower, count);
  const upper = brentRoot(upperEq, Math.max(count, Number.MIN_VALUE), exact.upper);
  return { lower, upper };
});

/**
 * Byar's approximation to the exact Poisson limits.
 * lower = x(1 − 1/(9x) − z/(3√x))³, upper = (x+1)(1 − 1/(9(x+1)) + z/(3√(x+1)))³.
 * It is within about 0.2% of the exact limits for x ≥ 10.
 *
 * @example
 * poissonByarLimits(10, 0.95) // { lower: 4.787449913967564, upper: 18.391458605756473 }
 */
export function poissonByarLimits(count: number, confidence: number): PoissonLimits {
  assertCount('count', count);
  assertConfidence(confidence);
  const z = zForConfidence(confidence);
  const x1 = count + 1;
  // Byar, in Rothman KJ, Boice JD. NIH Publ 79-1649, 1979; Breslow & Day 1987 Vol II.
  // The cube can go below 0 for very low confidence at tiny x; a mean cannot, so clamp at 0.
  const lower = count === 0 ? 0 : Math.max(0, count * (1 - 1 / (9 * count) - z / (3 * Math.sqrt(count))) ** 3);
  const upper = x1 * (1 - 1 / (9 * x1) + z / (3 * Math.sqrt(x1))) ** 3; // Byar (Rothman & Boice 1979)
  return { lower, upper };
}

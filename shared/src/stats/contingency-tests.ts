/**
 * Tests of independence in a 2×2 table: Pearson's chi-square without and with Yates'
 * continuity correction, and Fisher's exact test (two-sided by the minimum-likelihood rule).
 *
 * @example
 * pearsonChiSquare({ a: 56, b: 14, c: 48, d: 32 }) // { chi2: 7.023411371237458, df: 1, p: 0.008045081368196583 }
 */
import { chiSquareUpperTail } from './distributions';
import { MIN_LIKELIHOOD_RELATIVE_TOLERANCE } from './binomial-tests';
import { NoncentralHypergeometric } from './noncentral-hypergeometric';
import { margins, type TwoByTwo, validateTable } from './two-by-two';

export interface ChiSquareResult {
  chi2: number | null;
  df: 1;
  p: number | null;
  /** Why the statistic is undefined, when it is. */
  reason?: string;
}

function zeroMarginReason(t: TwoByTwo): string | null {
  const { n1, n0, m1, m0 } = margins(t);
  if (n1 === 0 || n0 === 0) return 'a group is empty: expected counts are 0';
  if (m1 === 0 || m0 === 0) return 'no events or no non-events at all: expected counts are 0';
  return null;
}

/**
 * Pearson chi-square, optionally with Yates' correction.
 * χ² = N(|ad − bc| − c)²/(n1 n0 m1 m0), c = 0 (Pearson) or N/2 capped so that no cell moves past
 * its expected value (Yates 1934; the cap as in R chisq.test and scipy, from memory).
 *
 * @example
 * pearsonChiSquare({ a: 56, b: 14, c: 48, d: 32 }, true).chi2 // 6.114270410296226
 */
export function pearsonChiSquare(t: TwoByTwo, yates = false): ChiSquareResult {
  validateTable(t);
  const why = zeroMarginReason(t);
  if (why) return { chi2: null, df: 1, p: null, reason: why };
  const { n1, n0, m1, m0, n } = margins(t);
  const diff = Math.abs(t.a * t.d - t.b * t.c);
  const corrected = yates ? Math.max(0, diff - n / 2) : diff;
  const chi2 = (n * corrected * corrected) / (n1 * n0 * m1 * m0); // N(ad − bc)²/(n1 n0 m1 m0)
  return { chi2, df: 1, p: chiSquareUpperTail(chi2, 1) };
}

/**
 * Fisher's exact test, two-sided: the sum of the central hypergeometric probabilities of all
 * tables with the same margins that are no more likely than the observed one (Fisher 1935;
 * the minimum-likelihood rule, with a 1e-7 relative tolerance for ties).
 *
 * @example
 * fisherExactP({ a: 56, b: 14, c: 48, d: 32 }) // 0.012521129749209164
 */
export function fisherExactP(t: TwoByTwo): number {
  validateTable(t);
  const { n1, n0, m1 } = margins(t);
  const dist = new NoncentralHypergeometric(n1, n0, m1);
  const probs = dist.probabilities(0);
  const observed = (probs[t.a - dist.lo] ?? 0) * MIN_LIKELIHOOD_RELATIVE_TOLERANCE;
  const p = probs.reduce((s, q) => (q <= observed ? s + q : s), 0);
  return Math.min(1, p);
}

/**
 * Mantel–Haenszel risk ratio and risk difference over strata of 2×2 tables, with the
 * Greenland–Robins (1985) variances (METHODS.md §8).
 */
import { undefinedBecause, type Reason } from './result-types';
import { margins, type TwoByTwo } from './two-by-two';
import { noStrata, ratioWithLogInterval, type MhEstimate } from './mh-estimate';

/** MH risk ratio with the Greenland–Robins variance. @example mantelHaenszelRiskRatio([{ a: 1, b: 1, c: 1, d: 1 }], 1.96, []).estimate // 1 */
export function mantelHaenszelRiskRatio(tables: TwoByTwo[], z: number, reasons: Reason[]): MhEstimate {
  if (tables.length === 0) return noStrata(reasons, 'mhRr', 'no stratum with events and both groups non-empty');
  let num = 0;
  let den = 0;
  let v = 0;
  for (const t of tables) {
    const { n1, n0, m1, n } = margins(t);
    num += (t.a * n0) / n; // Σ a n0/N
    den += (t.c * n1) / n; // Σ c n1/N
    v += (m1 * n1 * n0 - t.a * t.c * n) / (n * n); // Σ(M1 n1 n0 − a c N)/N² (Greenland & Robins 1985)
  }
  return ratioWithLogInterval(num, den, v / (num * den), z, 'mhRr', reasons);
}

/** MH risk difference with the Greenland–Robins variance. @example mantelHaenszelRiskDifference([{ a: 2, b: 2, c: 1, d: 3 }], 1.96, []).estimate // 0.25 */
export function mantelHaenszelRiskDifference(tables: TwoByTwo[], z: number, reasons: Reason[]): MhEstimate {
  if (tables.length === 0) return noStrata(reasons, 'mhRd', 'no stratum with both groups non-empty');
  let num = 0;
  let w = 0;
  let v = 0;
  for (const t of tables) {
    const { n1, n0, n } = margins(t);
    num += (t.a * n0 - t.c * n1) / n; // Σ(a n0 − c n1)/N
    w += (n1 * n0) / n; // Σ n1 n0/N
    v += (t.a * t.b * n0 ** 3 + t.c * t.d * n1 ** 3) / (n1 * n0 * n * n); // Greenland & Robins 1985
  }
  const estimate = num / w;
  if (v === 0) {
    undefinedBecause(reasons, 'mhRd.lower', 'every risk is 0 or 1: variance 0');
    undefinedBecause(reasons, 'mhRd.upper', 'every risk is 0 or 1: variance 0');
    return { estimate, lower: null, upper: null };
  }
  const se = Math.sqrt(v) / w;
  return { estimate, lower: estimate - z * se, upper: estimate + z * se };
}

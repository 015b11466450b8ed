/**
 * Benjamini–Hochberg adjusted p-values (false discovery rate), in the input order:
 * with p₍₁₎ ≤ … ≤ p₍ₘ₎, adj₍ᵢ₎ = min_{j ≥ i} min(1, m p₍ⱼ₎/j) (Benjamini & Hochberg, J R Stat Soc B
 * 1995;57:289–300). A null p-value (undefined test) stays null and is not counted in m.
 *
 * @example
 * benjaminiHochberg([0.01, 0.04, 0.03, 0.2]) // [0.04, 0.05333333333333334, 0.05333333333333334, 0.2]
 */
import { assertProbability } from './validation';

/**
 * Benjamini–Hochberg step-up adjustment.
 *
 * @example
 * benjaminiHochberg([0.5, null]) // [0.5, null]
 */
export function benjaminiHochberg(pValues: Array<number | null>): Array<number | null> {
  pValues.forEach((p, i) => {
    if (p !== null) assertProbability(`pValues[${i}]`, p);
  });
  const indexed = pValues
    .map((p, index) => ({ p, index }))
    .filter((x): x is { p: number; index: number } => x.p !== null)
    .sort((x, y) => x.p - y.p);
  const m = indexed.length;
  const adjusted: Array<number | null> = pValues.map(() => null);
  let running = 1;
  for (let k = m - 1; k >= 0; k--) {
    const item = indexed[k]!;
    running = Math.min(running, (m * item.p) / (k + 1)); // m p₍ᵢ₎/i, cumulative minimum from the top
    adjusted[item.index] = running;
  }
  return adjusted;
}

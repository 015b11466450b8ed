/** Tests of homogeneity of the odds ratio across strata: Breslow–Day (with Tarone's correction) and Woolf's (METHODS.md §8). */
import { chiSquareUpperTail } from './distributions';
import { undefinedBecause, type Reason } from './result-types';
import { margins, type TwoByTwo } from './two-by-two';
import { nullTest, type HomogeneityTest } from './mh-estimate';

/**
 * Breslow–Day statistic for homogeneity of odds ratios given a common ψ (the MH OR), with
 * Tarone's correction: χ²_BD = Σ(a − A)²/Var(A), where A solves A(n0 − m1 + A)/((n1 − A)(m1 − A)) = ψ
 * within the support and Var(A) = 1/(1/A + 1/B + 1/C + 1/D) (Breslow & Day 1980 Vol I, §4.4);
 * Tarone (Biometrika 1985;72:91–5) subtracts [Σ(a − A)]²/ΣVar(A).
 *
 * @example
 * breslowDay([{ a: 2, b: 1, c: 1, d: 2 }, { a: 1, b: 2, c: 2, d: 1 }], 1) // { chi2: 1.3333333333333333, tarone: 1.3333333333333333, df: 1 }
 */
export function breslowDay(tables: TwoByTwo[], psi: number): { chi2: number; tarone: number; df: number } {
  let chi2 = 0;
  let sumDiff = 0;
  let sumVar = 0;
  for (const t of tables) {
    const { n1, n0, m1, n } = margins(t);
    const lo = Math.max(0, m1 - n0);
    const hi = Math.min(n1, m1);
    // (1 − ψ)A² + (n0 − m1 + ψ(n1 + m1))A − ψ n1 m1 = 0
    const qa = 1 - psi;
    const qb = n0 - m1 + psi * (n1 + m1);
    const qc = -psi * n1 * m1;
    let big: number;
    if (qa === 0) big = (n1 * m1) / n;
    else {
      const disc = Math.sqrt(Math.max(0, qb * qb - 4 * qa * qc));
      const q = -(qb + (qb >= 0 ? disc : -disc)) / 2; // numerically stable quadratic roots q/qa and qc/q
      const roots = [q / qa, qc / q];
      const inside = roots.filter((x) => x >= lo - 1e-9 && x <= hi + 1e-9);
      big = inside[0] ?? roots[0]!;
    }
    const varA = 1 / (1 / big + 1 / (n1 - big) + 1 / (m1 - big) + 1 / (n0 - m1 + big));
    chi2 += (t.a - big) ** 2 / varA;
    sumDiff += t.a - big;
    sumVar += varA;
  }
  return { chi2, tarone: chi2 - (sumDiff * sumDiff) / sumVar, df: tables.length - 1 };
}

/**
 * Woolf's test of homogeneity of odds ratios: Σ wᵢ(ln ORᵢ − ln OR_w)², wᵢ = (1/a + 1/b + 1/c + 1/d)⁻¹,
 * K − 1 df (Woolf 1955). Undefined with a zero cell unless 0.5 is added to every cell
 * (Haldane–Anscombe), which is then a different, labelled method.
 *
 * @example
 * woolfOddsRatioHomogeneity([{ a: 2, b: 1, c: 1, d: 2 }, { a: 1, b: 2, c: 2, d: 1 }], false, []).chi2 // 1.2812080371152037
 */
export function woolfOddsRatioHomogeneity(tables: TwoByTwo[], haldane: boolean, reasons: Reason[]): HomogeneityTest {
  const field = haldane ? 'homogeneityWoolfHaldane' : 'homogeneityWoolf';
  if (tables.length < 2) {
    undefinedBecause(reasons, field, 'fewer than two strata informative on the odds ratio');
    return nullTest();
  }
  const add = haldane ? 0.5 : 0;
  if (!haldane && tables.some((t) => t.a === 0 || t.b === 0 || t.c === 0 || t.d === 0)) {
    undefinedBecause(reasons, field, 'a stratum has a zero cell (log of 0)');
    return nullTest();
  }
  const items = tables.map((t) => {
    const [a, b, c, d] = [t.a + add, t.b + add, t.c + add, t.d + add];
    return { lnOr: Math.log((a * d) / (b * c)), w: 1 / (1 / a + 1 / b + 1 / c + 1 / d) };
  });
  const sumW = items.reduce((s, x) => s + x.w, 0);
  const pooled = items.reduce((s, x) => s + x.w * x.lnOr, 0) / sumW;
  const chi2 = items.reduce((s, x) => s + x.w * (x.lnOr - pooled) ** 2, 0); // Woolf 1955
  const df = tables.length - 1;
  return { chi2, df, p: chiSquareUpperTail(chi2, df) };
}

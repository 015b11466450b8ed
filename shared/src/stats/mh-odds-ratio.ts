/**
 * Mantel–Haenszel odds ratio with the Robins–Breslow–Greenland (1986) variance and the
 * Cochran–Mantel–Haenszel test (METHODS.md §8).
 */
import { chiSquareUpperTail, twoSidedNormalP } from './distributions';
import { undefinedBecause, type Reason } from './result-types';
import { margins, type TwoByTwo } from './two-by-two';
import { noStrata, ratioWithLogInterval, type MhEstimate } from './mh-estimate';

/** MH odds ratio, RGB variance, and the uncorrected CMH test. @example mantelHaenszelOddsRatio([{ a: 2, b: 1, c: 1, d: 2 }], 1.96, []).estimate // 4 */
export function mantelHaenszelOddsRatio(tables: TwoByTwo[], z: number, reasons: Reason[]): MhEstimate & { p: number | null; chi2: number | null } {
  if (tables.length === 0) {
    undefinedBecause(reasons, 'mhOr.p', 'no stratum informative on the odds ratio');
    return { ...noStrata(reasons, 'mhOr', 'no stratum informative on the odds ratio'), p: null, chi2: null };
  }
  let r = 0;
  let s = 0;
  let pr = 0;
  let psqr = 0;
  let qs = 0;
  for (const t of tables) {
    const n = t.a + t.b + t.c + t.d;
    const ri = (t.a * t.d) / n; // Rᵢ = aᵢdᵢ/Nᵢ
    const si = (t.b * t.c) / n; // Sᵢ = bᵢcᵢ/Nᵢ
    const pi = (t.a + t.d) / n; // Pᵢ = (aᵢ + dᵢ)/Nᵢ
    const qi = (t.b + t.c) / n; // Qᵢ = (bᵢ + cᵢ)/Nᵢ
    r += ri;
    s += si;
    pr += pi * ri;
    psqr += pi * si + qi * ri;
    qs += qi * si;
  }
  // Var ln OR_MH = ΣPR/(2R²) + Σ(PS + QR)/(2RS) + ΣQS/(2S²) (Robins, Breslow & Greenland 1986)
  const varLog = pr / (2 * r * r) + psqr / (2 * r * s) + qs / (2 * s * s);
  const est = ratioWithLogInterval(r, s, varLog, z, 'mhOr', reasons);
  const cmh = cochranMantelHaenszel(tables, false);
  return { ...est, p: cmh.p, chi2: cmh.chi2 };
}

/**
 * Cochran–Mantel–Haenszel test, optionally with the ½ continuity correction (applied only when
 * |Σ(a − E)| ≥ ½, as R mantelhaen.test does; from memory).
 *
 * @example
 * cochranMantelHaenszel([{ a: 2, b: 1, c: 1, d: 2 }], false).chi2 // 0.5555555555555556
 */
export function cochranMantelHaenszel(tables: TwoByTwo[], correct: boolean): { chi2: number | null; p: number | null } {
  let delta = 0;
  let v = 0;
  for (const t of tables) {
    const { n1, n0, m1, m0, n } = margins(t);
    if (n < 2) continue;
    delta += t.a - (n1 * m1) / n; // a − E, E = n1 m1/N
    v += (n1 * n0 * m1 * m0) / (n * n * (n - 1)); // V = n1 n0 m1 m0/(N²(N − 1))
  }
  if (!(v > 0)) return { chi2: null, p: null };
  const cc = correct && Math.abs(delta) >= 0.5 ? 0.5 : 0;
  const chi2 = (Math.abs(delta) - cc) ** 2 / v; // (|Σ(a − E)| − cc)²/ΣV (Mantel & Haenszel 1959)
  return { chi2, p: correct ? chiSquareUpperTail(chi2, 1) : twoSidedNormalP(delta / Math.sqrt(v)) };
}

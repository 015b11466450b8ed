/**
 * Mantel–Haenszel analysis of 2×2 tables of risks over strata: the MH risk ratio and risk
 * difference with the Greenland–Robins (1985) variances, the MH odds ratio with the
 * Robins–Breslow–Greenland (1986) variance, the Cochran–Mantel–Haenszel test (without, and
 * optionally with, continuity correction), the Breslow–Day test of homogeneity of odds ratios
 * (with Tarone's correction beside it) and Woolf's homogeneity test.
 *
 * Strata handling: a stratum with an empty group contributes to nothing and is dropped; a
 * stratum without events contributes only to the MH RD (its weight is real information, a
 * difference of 0); a stratum where everyone has the event (no non-events) contributes to the RR
 * and RD but carries no information on the odds ratio. Every exclusion is reported.
 *
 * @example
 * stratifiedRisks([
 *   { exposed: { cases: 19, total: 52 }, reference: { cases: 4, total: 44 } },
 *   { exposed: { cases: 6, total: 10 }, reference: { cases: 5, total: 16 } },
 *   { exposed: { cases: 5, total: 12 }, reference: { cases: 20, total: 55 } },
 * ]).mhOr // { estimate: 3.086381252612906, lower: 1.490739561774826, upper: 6.3899486407534285, p: 0.002154050875845868, chi2: 9.41340298613254 }
 */
import { chiSquareUpperTail, twoSidedNormalP, zForConfidence } from './distributions';
import { METHODS } from './methods';
import { undefinedBecause, type Reason } from './result-types';
import { margins, type RiskGroup, tableFromGroups, type TwoByTwo } from './two-by-two';
import { assertConfidence, StatsValidationError } from './validation';

export interface RiskStratum {
  exposed: RiskGroup;
  reference: RiskGroup;
}

export interface MhEstimate {
  estimate: number | null;
  lower: number | null;
  upper: number | null;
}

export interface HomogeneityTest {
  chi2: number | null;
  df: number | null;
  p: number | null;
}

export interface StratifiedRisksResult {
  mhRr: MhEstimate;
  mhOr: MhEstimate & { p: number | null; chi2: number | null };
  mhRd: MhEstimate;
  /** CMH with continuity correction (|Σ(a − E)| − ½)², for comparison with tables that print it. */
  cmhCorrected: { chi2: number | null; p: number | null };
  /** Breslow–Day test of homogeneity of the odds ratio. */
  homogeneity: HomogeneityTest;
  homogeneityTarone: HomogeneityTest;
  homogeneityWoolf: HomogeneityTest;
  homogeneityWoolfHaldane: HomogeneityTest;
  droppedStrata: Array<{ index: number; reason: string; excludedFrom: string[] }>;
  confidence: number;
  methods: {
    mhRr: string;
    mhOr: string;
    mhOrTest: string;
    mhRd: string;
    cmhCorrected: string;
    homogeneity: string;
    homogeneityTarone: string;
    homogeneityWoolf: string;
    homogeneityWoolfHaldane: string;
  };
  reasons: Reason[];
}

const nullTest = (): HomogeneityTest => ({ chi2: null, df: null, p: null });

/**
 * Mantel–Haenszel analysis of stratified risks.
 * RR_MH = Σ a n0/N ÷ Σ c n1/N, Var ln = Σ(M1 n1 n0 − a c N)/N² ÷ [(Σ a n0/N)(Σ c n1/N)] (Greenland & Robins 1985);
 * OR_MH = Σ ad/N ÷ Σ bc/N with the RGB variance (Robins, Breslow & Greenland 1986);
 * RD_MH = Σ(a n0 − c n1)/N ÷ Σ n1 n0/N, Var = Σ(a b n0³ + c d n1³)/(n1 n0 N²) ÷ (Σ n1 n0/N)² (Greenland & Robins 1985);
 * χ²_CMH = [Σ(a − E)]²/ΣV, E = n1 m1/N, V = n1 n0 m1 m0/(N²(N − 1)) (Mantel & Haenszel 1959).
 *
 * @example
 * stratifiedRisks([{ exposed: { cases: 3, total: 6 }, reference: { cases: 0, total: 6 } }]).mhOr.estimate // Infinity
 */
export function stratifiedRisks(strata: RiskStratum[], confidence = 0.95): StratifiedRisksResult {
  if (!Array.isArray(strata) || strata.length === 0) throw new StatsValidationError([{ path: 'strata', message: 'must be a non-empty list of strata' }]);
  const tables = strata.map((s, i) => tableFromGroups(s.exposed, s.reference, `strata[${i}]`));
  assertConfidence(confidence);
  const z = zForConfidence(confidence);
  const reasons: Reason[] = [];
  const droppedStrata: StratifiedRisksResult['droppedStrata'] = [];
  const forRd: TwoByTwo[] = [];
  const forRr: TwoByTwo[] = [];
  const forOr: TwoByTwo[] = [];
  tables.forEach((t, index) => {
    const { n1, n0, m1, m0 } = margins(t);
    if (n1 === 0 || n0 === 0) {
      droppedStrata.push({ index, reason: `the ${n1 === 0 ? 'exposed' : 'reference'} group is empty`, excludedFrom: ['mhRr', 'mhOr', 'mhRd', 'homogeneity'] });
      return;
    }
    forRd.push(t);
    if (m1 === 0) {
      droppedStrata.push({ index, reason: 'no events in either group: contributes only to the MH risk difference', excludedFrom: ['mhRr', 'mhOr', 'homogeneity'] });
      return;
    }
    forRr.push(t);
    if (m0 === 0) {
      droppedStrata.push({ index, reason: 'every subject has the event: no information on the odds ratio', excludedFrom: ['mhOr', 'homogeneity'] });
      return;
    }
    forOr.push(t);
  });

  const mhRr = mantelHaenszelRiskRatio(forRr, z, reasons);
  const mhRd = mantelHaenszelRiskDifference(forRd, z, reasons);
  const mhOr = mantelHaenszelOddsRatio(forOr, z, reasons);
  const cmhCorrected = cochranMantelHaenszel(forOr, true);
  const homogeneity = nullTest();
  const homogeneityTarone = nullTest();
  if (forOr.length < 2) undefinedBecause(reasons, 'homogeneity', 'fewer than two strata informative on the odds ratio');
  else if (mhOr.estimate === null || mhOr.estimate === 0 || mhOr.estimate === Infinity) undefinedBecause(reasons, 'homogeneity', 'the MH odds ratio is 0, infinite or undefined');
  else {
    const bd = breslowDay(forOr, mhOr.estimate);
    Object.assign(homogeneity, { chi2: bd.chi2, df: bd.df, p: chiSquareUpperTail(bd.chi2, bd.df) });
    Object.assign(homogeneityTarone, { chi2: bd.tarone, df: bd.df, p: chiSquareUpperTail(bd.tarone, bd.df) });
  }
  return {
    mhRr,
    mhOr,
    mhRd,
    cmhCorrected,
    homogeneity,
    homogeneityTarone,
    homogeneityWoolf: woolfOddsRatioHomogeneity(forOr, false, reasons),
    homogeneityWoolfHaldane: woolfOddsRatioHomogeneity(forOr, true, reasons),
    droppedStrata,
    confidence,
    methods: {
      mhRr: METHODS.mhRr,
      mhOr: METHODS.mhOr,
      mhOrTest: METHODS.cmh,
      mhRd: METHODS.mhRd,
      cmhCorrected: METHODS.cmhCorrected,
      homogeneity: METHODS.breslowDay,
      homogeneityTarone: METHODS.breslowDayTarone,
      homogeneityWoolf: METHODS.woolfOrHomogeneity,
      homogeneityWoolfHaldane: METHODS.woolfOrHomogeneityHaldane,
    },
    reasons,
  };
}

function noStrata(reasons: Reason[], field: string, why: string): MhEstimate {
  for (const f of ['estimate', 'lower', 'upper']) undefinedBecause(reasons, `${field}.${f}`, why);
  return { estimate: null, lower: null, upper: null };
}

function ratioWithLogInterval(num: number, den: number, varLog: number, z: number, field: string, reasons: Reason[]): MhEstimate {
  const estimate = den === 0 ? Infinity : num / den;
  if (num === 0 || den === 0) {
    const why = num === 0 ? 'the numerator sum is 0 (log of 0)' : 'the denominator sum is 0 (log of 0)';
    undefinedBecause(reasons, `${field}.lower`, why);
    undefinedBecause(reasons, `${field}.upper`, why);
    return { estimate, lower: null, upper: null };
  }
  const se = Math.sqrt(varLog);
  return { estimate, lower: estimate * Math.exp(-z * se), upper: estimate * Math.exp(z * se) };
}

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

/** MH odds ratio, RGB variance, and the uncorrected CMH test. @example mantelHaenszelOddsRatio([{ a: 2, b: 1, c: 1, d: 2 }], 1.96, []).estimate // 4 */
export function mantelHaenszelOddsRatio(tables: TwoByTwo[], z: number, reasons: Reason[]): StratifiedRisksResult['mhOr'] {
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

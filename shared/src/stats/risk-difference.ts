/**
 * Risk difference RD = p1 − p0 (p1 = a/n1, p0 = c/n0) with the Wald interval, Newcombe's
 * hybrid-score interval (method 10), and the score-inversion intervals of Mee and of
 * Miettinen–Nurminen.
 *
 * @example
 * riskDifference({ a: 56, b: 14, c: 48, d: 32 }).newcombe // { lower: 0.0524314724023649, upper: 0.3338726540369059 }
 */
import { zForConfidence } from './distributions';
import { METHODS } from './methods';
import { wilsonInterval } from './proportion-intervals';
import { nullInterval, undefinedBecause, type Interval, type Reason } from './result-types';
import { margins, type TwoByTwo, validateTable } from './two-by-two';
import { assertConfidence } from './validation';

export interface RiskDifferenceResult {
  estimate: number | null;
  wald: Interval;
  newcombe: Interval;
  mee: Interval;
  miettinenNurminen: Interval;
  confidence: number;
  methods: { wald: string; newcombe: string; mee: string; miettinenNurminen: string };
  reasons: Reason[];
}

/**
 * Restricted maximum-likelihood estimates of (p1, p0) under p1 − p0 = δ, the closed-form cubic
 * root of Miettinen & Nurminen (Stat Med 1985;4:213–26, appendix), as also given by
 * Farrington & Manning (Stat Med 1990;9:1447–54).
 *
 * @example
 * restrictedRiskMle(56, 70, 48, 80, 0) // { p1: 0.6933333333333337, p0: 0.6933333333333337 } (the pooled risk)
 */
export function restrictedRiskMle(x1: number, n1: number, x0: number, n0: number, delta: number): { p1: number; p0: number } {
  const p1hat = x1 / n1;
  const p0hat = x0 / n0;
  const theta = n0 / n1;
  const a = 1 + theta;
  const b = -(1 + theta + p1hat + theta * p0hat + delta * (theta + 2));
  const c = delta * delta + delta * (2 * p1hat + theta + 1) + p1hat + theta * p0hat;
  const d = -p1hat * delta * (1 + delta);
  const v = b ** 3 / (27 * a ** 3) - (b * c) / (6 * a * a) + d / (2 * a);
  const s = (b * b) / (9 * a * a) - c / (3 * a);
  const u = (v < 0 ? -1 : 1) * Math.sqrt(Math.max(0, s));
  // u = 0 makes the trigonometric form 0/0; the root is then the inflection point −b/(3a).
  const w = u === 0 ? Math.PI / 2 : (Math.PI + Math.acos(Math.max(-1, Math.min(1, v / u ** 3)))) / 3;
  const clamp = (p: number) => Math.max(0, Math.min(1, p));
  const p1 = clamp(2 * u * Math.cos(w) - b / (3 * a));
  const p0 = clamp(p1 - delta);
  return { p1, p0 };
}

/**
 * Score-inversion interval for the RD: all δ with |z(δ)| ≤ z_{1−α/2}, where
 * z(δ) = (p̂1 − p̂0 − δ)/√(k·[p̃1(1 − p̃1)/n1 + p̃0(1 − p̃0)/n0]), k = 1 (Mee 1984) or N/(N − 1)
 * (Miettinen & Nurminen 1985). z is decreasing in δ, so each limit is found by bisection.
 *
 * @example
 * scoreRiskDifferenceInterval({ a: 56, b: 14, c: 48, d: 32 }, 0.95, false) // { lower: 0.05333384929132521, upper: 0.3377294637411413 }
 */
export function scoreRiskDifferenceInterval(t: TwoByTwo, confidence: number, nurminenFactor: boolean): { lower: number; upper: number } {
  const { n1, n0, n } = margins(t);
  const rd = t.a / n1 - t.c / n0;
  const zCrit = zForConfidence(confidence);
  const k = nurminenFactor ? n / (n - 1) : 1; // N/(N − 1) for Miettinen–Nurminen only
  const score = (delta: number): number => {
    const diff = rd - delta;
    if (diff === 0) return 0;
    const { p1, p0 } = restrictedRiskMle(t.a, n1, t.c, n0, delta);
    const variance = k * ((p1 * (1 - p1)) / n1 + (p0 * (1 - p0)) / n0);
    return variance <= 0 ? (diff > 0 ? Infinity : -Infinity) : diff / Math.sqrt(variance);
  };
  // Bisection to full double precision: f(δ) = score(δ) − target is decreasing in δ.
  const solve = (lo: number, hi: number, target: number): number => {
    for (let i = 0; i < 200 && hi - lo > 1e-16; i++) {
      const mid = (lo + hi) / 2;
      if (score(mid) > target) lo = mid;
      else hi = mid;
    }
    return (lo + hi) / 2;
  };
  const lower = rd === -1 || score(-1) <= zCrit ? -1 : solve(-1, rd, zCrit);
  const upper = rd === 1 || score(1) >= -zCrit ? 1 : solve(rd, 1, -zCrit);
  return { lower, upper };
}

/**
 * Risk difference with Wald, Newcombe hybrid-score, Mee and Miettinen–Nurminen intervals.
 * Wald: RD ± z√(p1q1/n1 + p0q0/n0) (zero width at 0/n and n/n, can leave [−1, 1]; not recommended).
 * Newcombe method 10: lower = RD − √((p1 − l1)² + (u0 − p0)²), upper = RD + √((u1 − p1)² + (p0 − l0)²)
 * with Wilson limits (l, u) of each proportion (Newcombe, Stat Med 1998;17:873–90).
 *
 * @example
 * riskDifference({ a: 0, b: 10, c: 0, d: 20 }).newcombe // { lower: -0.16112515805281932, upper: 0.27753279986288915 }
 */
export function riskDifference(t: TwoByTwo, confidence = 0.95): RiskDifferenceResult {
  validateTable(t);
  assertConfidence(confidence);
  const methods = { wald: METHODS.rdWald, newcombe: METHODS.rdNewcombe, mee: METHODS.rdMee, miettinenNurminen: METHODS.rdMiettinenNurminen };
  const reasons: Reason[] = [];
  const { n1, n0 } = margins(t);
  if (n1 === 0 || n0 === 0) {
    const why = n1 === 0 ? 'the exposed group is empty' : 'the reference group is empty';
    for (const f of ['estimate', 'wald', 'newcombe', 'mee', 'miettinenNurminen']) undefinedBecause(reasons, f, why);
    const i = nullInterval;
    return { estimate: null, wald: i(), newcombe: i(), mee: i(), miettinenNurminen: i(), confidence, methods, reasons };
  }
  const p1 = t.a / n1;
  const p0 = t.c / n0;
  const estimate = p1 - p0; // RD = p1 − p0
  const z = zForConfidence(confidence);
  const se = Math.sqrt((p1 * (1 - p1)) / n1 + (p0 * (1 - p0)) / n0); // Wald SE
  let wald: Interval;
  if (se === 0) {
    wald = nullInterval();
    undefinedBecause(reasons, 'wald', 'both risks are 0 or 1: Wald variance is 0');
  } else wald = { lower: estimate - z * se, upper: estimate + z * se };
  const w1 = wilsonInterval(t.a, n1, confidence);
  const w0 = wilsonInterval(t.c, n0, confidence);
  const newcombe = {
    lower: estimate - Math.sqrt((p1 - w1.lower) ** 2 + (w0.upper - p0) ** 2), // Newcombe 1998, method 10
    upper: estimate + Math.sqrt((w1.upper - p1) ** 2 + (p0 - w0.lower) ** 2), // Newcombe 1998, method 10
  };
  return {
    estimate,
    wald,
    newcombe,
    mee: scoreRiskDifferenceInterval(t, confidence, false),
    miettinenNurminen: scoreRiskDifferenceInterval(t, confidence, true),
    confidence,
    methods,
    reasons,
  };
}

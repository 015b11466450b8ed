/**
 * Attributable fractions from a 2×2 table of risks.
 *
 * - Among the exposed: AF_e = (RR − 1)/RR with limits (RR_L − 1)/RR_L, (RR_U − 1)/RR_U from the
 *   Katz limits (Rothman & Greenland 1998, ch. 4). Negative when RR < 1 (1 − RR is then the
 *   preventive fraction).
 * - In the population (Levin 1953): PAF = pₑ(RR − 1)/(1 + pₑ(RR − 1)), pₑ = n1/N, which equals
 *   (p − p0)/p with p = (a + c)/N. Limits on log(1 − PAF) with
 *   Var = (b + PAF(a + d))/(N c) (Walter 1975, as given by Jewell, Statistics for Epidemiology
 *   2004; from memory).
 *
 * @example
 * attributableRisk({ a: 13, b: 2163, c: 5, d: 3349 }).afExposed // { estimate: 0.7504701619191779, lower: 0.30105799980098896, upper: 0.9109151545122308 }
 */
import { zForConfidence } from './distributions';
import { METHODS } from './methods';
import { attributableFractionOf } from './attributable-fraction';
import { riskRatio } from './risk-ratio';
import { undefinedBecause, type Reason } from './result-types';
import { margins, type TwoByTwo, validateTable } from './two-by-two';
import { assertConfidence } from './validation';

export interface AttributableRiskResult {
  afExposed: { estimate: number | null; lower: number | null; upper: number | null };
  afPopulation: { estimate: number | null; lower: number | null; upper: number | null };
  confidence: number;
  methods: { afExposed: string; afPopulation: string };
  reasons: Reason[];
}

/**
 * Attributable fraction among the exposed and population attributable fraction.
 *
 * @example
 * attributableRisk({ a: 13, b: 2163, c: 5, d: 3349 }).afPopulation // { estimate: 0.5420062280527397, lower: 0.03613801753310453, upper: 0.7823772501062585 }
 */
export function attributableRisk(t: TwoByTwo, confidence = 0.95): AttributableRiskResult {
  validateTable(t);
  assertConfidence(confidence);
  const reasons: Reason[] = [];
  const rr = riskRatio(t, confidence);
  const afExposed = {
    estimate: attributableFractionOf(rr.estimate),
    lower: attributableFractionOf(rr.katz.lower),
    upper: attributableFractionOf(rr.katz.upper),
  };
  if (rr.estimate === null) undefinedBecause(reasons, 'afExposed.estimate', 'the risk ratio is undefined');
  if (rr.katz.lower === null) undefinedBecause(reasons, 'afExposed.lower', 'the Katz risk-ratio interval is undefined');
  const { n0, n } = margins(t);
  const afPopulation: AttributableRiskResult['afPopulation'] = { estimate: null, lower: null, upper: null };
  const events = t.a + t.c;
  if (n0 === 0 || events === 0) {
    undefinedBecause(reasons, 'afPopulation', n0 === 0 ? 'the reference group is empty' : 'no events');
  } else {
    const p = events / n;
    const p0 = t.c / n0;
    const paf = (p - p0) / p; // Levin 1953, as (p − p0)/p
    afPopulation.estimate = paf;
    if (t.c === 0) {
      undefinedBecause(reasons, 'afPopulation.lower', 'no events in the reference group');
      undefinedBecause(reasons, 'afPopulation.upper', 'no events in the reference group');
    } else {
      const z = zForConfidence(confidence);
      const se = Math.sqrt((t.b + paf * (t.a + t.d)) / (n * t.c)); // Var log(1 − PAF) (Walter 1975; Jewell 2004)
      const centre = Math.log(1 - paf);
      afPopulation.lower = 1 - Math.exp(centre + z * se);
      afPopulation.upper = 1 - Math.exp(centre - z * se);
    }
  }
  return { afExposed, afPopulation, confidence, methods: { afExposed: METHODS.afExposedRisk, afPopulation: METHODS.pafLevin }, reasons };
}

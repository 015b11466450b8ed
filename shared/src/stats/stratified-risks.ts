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
import { chiSquareUpperTail, zForConfidence } from './distributions';
import { METHODS } from './methods';
import { nullTest, type HomogeneityTest, type MhEstimate } from './mh-estimate';
import { cochranMantelHaenszel, mantelHaenszelOddsRatio } from './mh-odds-ratio';
import { mantelHaenszelRiskDifference, mantelHaenszelRiskRatio } from './mh-risk-measures';
import { breslowDay, woolfOddsRatioHomogeneity } from './odds-ratio-homogeneity';
import { undefinedBecause, type Reason } from './result-types';
import { margins, type RiskGroup, tableFromGroups, type TwoByTwo } from './two-by-two';
import { assertConfidence, StatsValidationError } from './validation';

export type { HomogeneityTest, MhEstimate } from './mh-estimate';
export { cochranMantelHaenszel, mantelHaenszelOddsRatio } from './mh-odds-ratio';
export { mantelHaenszelRiskDifference, mantelHaenszelRiskRatio } from './mh-risk-measures';
export { breslowDay, woolfOddsRatioHomogeneity } from './odds-ratio-homogeneity';

export interface RiskStratum {
  exposed: RiskGroup;
  reference: RiskGroup;
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
      droppedStrata.push({
        index,
        reason: 'no events in either group: contributes only to the MH risk difference',
        excludedFrom: ['mhRr', 'mhOr', 'homogeneity'],
      });
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
  else if (mhOr.estimate === null || mhOr.estimate === 0 || mhOr.estimate === Infinity)
    undefinedBecause(reasons, 'homogeneity', 'the MH odds ratio is 0, infinite or undefined');
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

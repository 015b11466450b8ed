/**
 * Full comparison of risks in a 2×2 table: RD (Wald, Newcombe, Mee, Miettinen–Nurminen),
 * RR (Katz), OR (Woolf, exact conditional), Pearson chi-square with and without Yates,
 * Fisher's exact p, NNT from the Newcombe RD limits (Altman) and attributable fractions.
 *
 * @example
 * compareRisks({ cases: 56, total: 70 }, { cases: 48, total: 80 }).nnt.estimate // 5
 */
import { fisherExactP, pearsonChiSquare, type ChiSquareResult } from './contingency-tests';
import { METHODS } from './methods';
import { numberNeeded, type NumberNeededResult } from './number-needed';
import { oddsRatio, type OddsRatioResult } from './odds-ratio';
import { prefixReasons, undefinedBecause, type Reason } from './result-types';
import { attributableRisk, type AttributableRiskResult } from './attributable-risk';
import { riskDifference, type RiskDifferenceResult } from './risk-difference';
import { riskRatio, type RiskRatioResult } from './risk-ratio';
import { type RiskGroup, tableFromGroups, type TwoByTwo } from './two-by-two';
import { assertConfidence } from './validation';

export interface RiskComparisonResult {
  table: TwoByTwo;
  riskExposed: number | null;
  riskReference: number | null;
  rd: RiskDifferenceResult;
  rr: RiskRatioResult;
  or: OddsRatioResult;
  chiSquare: ChiSquareResult;
  chiSquareYates: ChiSquareResult;
  pChiSquare: number | null;
  pChiSquareYates: number | null;
  pFisher: number | null;
  nnt: NumberNeededResult;
  attributable: AttributableRiskResult;
  confidence: number;
  methods: { chiSquare: string; chiSquareYates: string; fisher: string; nnt: string };
  reasons: Reason[];
}

/**
 * Compare the risk in an exposed group with that in a reference group.
 *
 * @example
 * compareRisks({ cases: 0, total: 10 }, { cases: 0, total: 20 }).rr.estimate // null
 */
export function compareRisks(exposed: RiskGroup, reference: RiskGroup, confidence = 0.95): RiskComparisonResult {
  const table = tableFromGroups(exposed, reference);
  assertConfidence(confidence);
  const rd = riskDifference(table, confidence);
  const rr = riskRatio(table, confidence);
  const or = oddsRatio(table, confidence);
  const chiSquare = pearsonChiSquare(table, false);
  const chiSquareYates = pearsonChiSquare(table, true);
  const nnt = numberNeeded(rd.estimate, rd.newcombe);
  const attributable = attributableRisk(table, confidence);
  const reasons: Reason[] = [
    ...prefixReasons('rd', rd.reasons),
    ...prefixReasons('rr', rr.reasons),
    ...prefixReasons('or', or.reasons),
    ...prefixReasons('nnt', nnt.reasons),
    ...prefixReasons('attributable', attributable.reasons),
  ];
  if (chiSquare.reason) undefinedBecause(reasons, 'pChiSquare', chiSquare.reason);
  if (chiSquareYates.reason) undefinedBecause(reasons, 'pChiSquareYates', chiSquareYates.reason);
  const n1 = exposed.total;
  const n0 = reference.total;
  const riskExposed = n1 === 0 ? undefinedBecause(reasons, 'riskExposed', 'the exposed group is empty') : exposed.cases / n1;
  const riskReference = n0 === 0 ? undefinedBecause(reasons, 'riskReference', 'the reference group is empty') : reference.cases / n0;
  return {
    table,
    riskExposed,
    riskReference,
    rd,
    rr,
    or,
    chiSquare,
    chiSquareYates,
    pChiSquare: chiSquare.p,
    pChiSquareYates: chiSquareYates.p,
    pFisher: fisherExactP(table),
    nnt,
    attributable,
    confidence,
    methods: { chiSquare: METHODS.chiSquare, chiSquareYates: METHODS.chiSquareYates, fisher: METHODS.fisher, nnt: METHODS.nnt },
    reasons,
  };
}

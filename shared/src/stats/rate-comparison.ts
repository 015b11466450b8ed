/**
 * Comparison of an exposed group with a reference group on person-time data: both rates,
 * the rate ratio, the rate difference, the attributable fractions and the excess cases.
 *
 * - AF among the exposed = (IRR − 1)/IRR, limits from the exact IRR limits (METHODS.md §10).
 * - Population AF (Miettinen) = p_c (IRR − 1)/IRR with p_c = a/M, which equals
 *   (a − b·T1/T0)/M, the excess cases as a share of all cases (Rothman & Greenland 1998, ch. 4).
 * - Excess cases = a − b·T1/T0, the exposed cases beyond those expected at the reference rate.
 *
 * @example
 * compareRates({ cases: 41, personTime: 28010 }, { cases: 15, personTime: 19017 }).irr.estimate // 1.8557586576222778
 */
import { incidenceRate, type IncidenceRateResult, type RateGroup, type RateOptions, resolveRateOptions, validateRateGroup } from './incidence-rate';
import { attributableFractionOf } from './attributable-fraction';
import { METHODS } from './methods';
import { rateDifference, type RateDifferenceResult } from './rate-difference';
import { rateRatio, type RateRatioResult } from './rate-ratio';
import { prefixReasons, undefinedBecause, type Reason } from './result-types';

export interface AttributableFractionResult {
  estimate: number | null;
  lower: number | null;
  upper: number | null;
}

export interface RateComparisonResult {
  rateExposed: IncidenceRateResult;
  rateReference: IncidenceRateResult;
  irr: RateRatioResult;
  ird: RateDifferenceResult;
  afExposed: AttributableFractionResult;
  afPopulation: number | null;
  excessCases: number | null;
  confidence: number;
  per: number;
  methods: { afExposed: string; afPopulation: string };
  reasons: Reason[];
}

/**
 * Full two-group comparison of rates.
 *
 * @example
 * compareRates({ cases: 0, personTime: 1000 }, { cases: 5, personTime: 2000 }).afPopulation // -0.5
 */
export function compareRates(exposed: RateGroup, reference: RateGroup, options: RateOptions = {}): RateComparisonResult {
  validateRateGroup('exposed', exposed);
  validateRateGroup('reference', reference);
  const { confidence, per } = resolveRateOptions(options);
  const rateExposed = incidenceRate(exposed, { confidence, per });
  const rateReference = incidenceRate(reference, { confidence, per });
  const irr = rateRatio(exposed, reference, confidence);
  const ird = rateDifference(exposed, reference, confidence, per);
  const reasons: Reason[] = [
    ...prefixReasons('rateExposed', rateExposed.reasons),
    ...prefixReasons('rateReference', rateReference.reasons),
    ...prefixReasons('irr', irr.reasons),
    ...prefixReasons('ird', ird.reasons),
  ];

  const afExposed: AttributableFractionResult = {
    estimate: attributableFractionOf(irr.estimate),
    lower: attributableFractionOf(irr.exact.lower),
    upper: attributableFractionOf(irr.exact.upper),
  };
  if (irr.estimate === null) undefinedBecause(reasons, 'afExposed', 'the rate ratio is undefined');

  const { cases: a, personTime: t1 } = exposed;
  const { cases: b, personTime: t0 } = reference;
  let excessCases: number | null = null;
  let afPopulation: number | null = null;
  if (t0 === 0 || t1 === 0) {
    undefinedBecause(reasons, 'excessCases', t0 === 0 ? 'no person-time in the reference group' : 'no person-time in the exposed group');
    undefinedBecause(reasons, 'afPopulation', 'the rate ratio is undefined');
  } else {
    excessCases = a - (b * t1) / t0; // a − b·T1/T0
    // p_c (IRR − 1)/IRR = (a − b·T1/T0)/M (Miettinen 1974; Rothman & Greenland 1998)
    afPopulation = a + b === 0 ? undefinedBecause(reasons, 'afPopulation', 'no cases in either group') : excessCases / (a + b);
  }
  return {
    rateExposed,
    rateReference,
    irr,
    ird,
    afExposed,
    afPopulation,
    excessCases,
    confidence,
    per,
    methods: { afExposed: METHODS.afExposed, afPopulation: METHODS.afPopulation },
    reasons,
  };
}

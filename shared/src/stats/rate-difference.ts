/**
 * Incidence rate difference (IRD) a/T1 − b/T0 with the Wald interval,
 * Var = a/T1² + b/T0² (Rothman & Greenland 1998, ch. 14). It stays defined with one zero
 * count; with no cases in either group the variance is 0 and the interval is not estimable.
 *
 * @example
 * rateDifference({ cases: 41, personTime: 28010 }, { cases: 15, personTime: 19017 }, 0.9, 10000)
 * // { estimate: 6.7499499733576105, wald: { lower: 1.714022326115157, upper: 11.785877620600065 },
 * //   p: 0.02747557128750907, confidence: 0.9, per: 10000, methods: { wald: 'Wald' }, reasons: [] }
 */
import { twoSidedNormalP, zForConfidence } from './distributions';
import { type RateGroup, resolveRateOptions, validateRateGroup } from './incidence-rate';
import { METHODS } from './methods';
import { nullInterval, undefinedBecause, type Interval, type Reason } from './result-types';

export interface RateDifferenceResult {
  estimate: number | null;
  wald: Interval;
  /** Two-sided Wald p for IRD = 0. */
  p: number | null;
  confidence: number;
  per: number;
  methods: { wald: string };
  reasons: Reason[];
}

/**
 * Rate difference × per with its Wald interval and z test.
 *
 * @example
 * rateDifference({ cases: 0, personTime: 10 }, { cases: 0, personTime: 10 }).wald // { lower: null, upper: null }
 */
export function rateDifference(exposed: RateGroup, reference: RateGroup, confidence = 0.95, per = 1): RateDifferenceResult {
  validateRateGroup('exposed', exposed);
  validateRateGroup('reference', reference);
  resolveRateOptions({ confidence, per });
  const { cases: a, personTime: t1 } = exposed;
  const { cases: b, personTime: t0 } = reference;
  const methods = { wald: METHODS.irdWald };
  const reasons: Reason[] = [];
  if (t1 === 0 || t0 === 0) {
    const why = t1 === 0 ? 'no person-time in the exposed group' : 'no person-time in the reference group';
    for (const f of ['estimate', 'wald', 'p']) undefinedBecause(reasons, f, why);
    return { estimate: null, wald: nullInterval(), p: null, confidence, per, methods, reasons };
  }
  const estimate = (a / t1 - b / t0) * per; // IRD = a/T1 − b/T0
  const se = Math.sqrt(a / t1 ** 2 + b / t0 ** 2) * per; // Var = a/T1² + b/T0² (Rothman & Greenland 1998)
  if (se === 0) {
    const why = 'no cases in either group: variance 0, not estimable';
    undefinedBecause(reasons, 'wald', why);
    undefinedBecause(reasons, 'p', why);
    return { estimate, wald: nullInterval(), p: null, confidence, per, methods, reasons };
  }
  if (a < 5 || b < 5) reasons.push({ field: 'wald', reason: 'fewer than 5 cases in a group: Wald coverage is poor (interval given)' });
  const z = zForConfidence(confidence);
  return {
    estimate,
    wald: { lower: estimate - z * se, upper: estimate + z * se },
    p: twoSidedNormalP(estimate / se),
    confidence,
    per,
    methods,
    reasons,
  };
}

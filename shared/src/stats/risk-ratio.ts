/**
 * Risk ratio RR = (a/n1)/(c/n0) with the Katz log interval,
 * SE(ln RR) = √(1/a − 1/n1 + 1/c − 1/n0) (Katz D et al. Biometrics 1978;34:469–74).
 * No 0.5 is added silently: with a = 0 or c = 0 the Katz interval is undefined.
 *
 * @example
 * riskRatio({ a: 13, b: 2163, c: 5, d: 3349 }).katz // { lower: 1.4307338802293583, upper: 11.22525379625083 }
 */
import { zForConfidence } from './distributions';
import { METHODS } from './methods';
import { nullInterval, undefinedBecause, type Interval, type Reason } from './result-types';
import { margins, type TwoByTwo, validateTable } from './two-by-two';
import { assertConfidence } from './validation';

export interface RiskRatioResult {
  estimate: number | null;
  katz: Interval;
  confidence: number;
  methods: { katz: string };
  reasons: Reason[];
}

/**
 * Risk ratio with the Katz interval; c = 0 < a gives ∞, a = 0 < c gives 0.
 *
 * @example
 * riskRatio({ a: 5, b: 51, c: 0, d: 29 }).estimate // Infinity
 */
export function riskRatio(t: TwoByTwo, confidence = 0.95): RiskRatioResult {
  validateTable(t);
  assertConfidence(confidence);
  const methods = { katz: METHODS.rrKatz };
  const reasons: Reason[] = [];
  const { n1, n0 } = margins(t);
  if (n1 === 0 || n0 === 0) {
    const why = n1 === 0 ? 'the exposed group is empty' : 'the reference group is empty';
    undefinedBecause(reasons, 'estimate', why);
    undefinedBecause(reasons, 'katz', why);
    return { estimate: null, katz: nullInterval(), confidence, methods, reasons };
  }
  const { a, c } = t;
  let estimate: number | null;
  if (a === 0 && c === 0) estimate = undefinedBecause(reasons, 'estimate', 'no events in either group');
  else if (c === 0) estimate = Infinity;
  else estimate = a / n1 / (c / n0); // RR = p1/p0
  if (a === 0 || c === 0) {
    undefinedBecause(reasons, 'katz', a === 0 ? 'no events in the exposed group (log of 0)' : 'no events in the reference group (log of 0)');
    return { estimate, katz: nullInterval(), confidence, methods, reasons };
  }
  const z = zForConfidence(confidence);
  const se = Math.sqrt(1 / a - 1 / n1 + 1 / c - 1 / n0); // Katz et al. 1978
  const rr = estimate as number;
  return { estimate, katz: { lower: rr * Math.exp(-z * se), upper: rr * Math.exp(z * se) }, confidence, methods, reasons };
}

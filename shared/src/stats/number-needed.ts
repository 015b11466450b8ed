/**
 * Number needed to treat or harm, NNT = 1/RD, with the interval of Altman (BMJ 1998;317:1309–12):
 * invert and exchange the RD limits, (1/RD_U, 1/RD_L). With RD = risk exposed − risk reference
 * for an adverse outcome, a positive NNT is a number needed to harm (NNTH) and a negative one a
 * number needed to benefit (NNTB). When the RD interval contains 0 the NNT interval is not a
 * single interval but runs from NNTH 1/RD_U through infinity to NNTB |1/RD_L|; it is encoded as
 * lower = 1/RD_U, upper = 1/RD_L (negative) with `throughInfinity: true`.
 *
 * @example
 * numberNeeded(0.2, { lower: 0.0524314724, upper: 0.333872654 })
 * // { estimate: 5, lower: 2.995153954717118, upper: 19.07251416422172, direction: 'harm', throughInfinity: false, reasons: [] }
 */
import { type Interval, undefinedBecause, type Reason } from './result-types';

export interface NumberNeededResult {
  estimate: number | null;
  lower: number | null;
  upper: number | null;
  /** 'harm' when RD > 0 (exposure adds cases), 'benefit' when RD < 0. */
  direction: 'harm' | 'benefit' | null;
  /** True when the RD interval contains 0: the NNT set runs through infinity. */
  throughInfinity: boolean;
  reasons: Reason[];
}

const invert = (x: number): number => (x === 0 ? Infinity : 1 / x);

/**
 * NNT from a risk difference and its interval (Altman 1998).
 *
 * @example
 * numberNeeded(0.0893, { lower: -0.0381, upper: 0.1926 }).throughInfinity // true
 */
export function numberNeeded(rd: number | null, rdInterval: Interval): NumberNeededResult {
  const reasons: Reason[] = [];
  let estimate: number | null;
  let direction: NumberNeededResult['direction'] = null;
  if (rd === null) estimate = undefinedBecause(reasons, 'estimate', 'the risk difference is undefined');
  else if (rd === 0) estimate = undefinedBecause(reasons, 'estimate', 'the risk difference is 0: the NNT is infinite with no direction');
  else {
    estimate = 1 / rd; // NNT = 1/RD (Altman 1998)
    direction = rd > 0 ? 'harm' : 'benefit';
  }
  const { lower: l, upper: u } = rdInterval;
  if (l === null || u === null) {
    undefinedBecause(reasons, 'lower', 'the risk-difference interval is undefined');
    undefinedBecause(reasons, 'upper', 'the risk-difference interval is undefined');
    return { estimate, lower: null, upper: null, direction, throughInfinity: false, reasons };
  }
  const throughInfinity = l <= 0 && u >= 0;
  if (throughInfinity) reasons.push({ field: 'lower', reason: 'the risk-difference interval contains 0: NNTH from lower through infinity to NNTB |upper|' });
  // Exchange and invert: (1/RD_U, 1/RD_L) (Altman 1998). A limit at exactly 0 maps to +∞ (NNTH side) or, for the lower RD limit, −∞ (NNTB side).
  const lower = u === 0 ? Infinity : invert(u);
  const upper = l === 0 ? -Infinity : invert(l);
  return { estimate, lower, upper, direction, throughInfinity, reasons };
}

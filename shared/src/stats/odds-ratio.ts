/**
 * Odds ratio OR = ad/(bc) with the Woolf logit interval and the exact conditional analysis:
 * the conditional maximum-likelihood estimate and the exact (Cornfield/Fisher) limits from the
 * noncentral hypergeometric distribution of a given the margins.
 *
 * - Woolf: SE(ln OR) = √(1/a + 1/b + 1/c + 1/d) (Woolf 1955), undefined with a zero cell.
 * - CMLE: the ψ solving E[A; ψ] = a (Breslow & Day 1980 Vol I, §4.2).
 * - Exact limits: P(A ≥ a; ψ_L) = α/2 and P(A ≤ a; ψ_U) = α/2 (Cornfield 1956).
 *
 * @example
 * oddsRatio({ a: 30, b: 44, c: 29, d: 86 }).exact // { estimate: 2.0141194925799533, lower: 1.028777629510316, upper: 3.964756128310798 }
 */
import { zForConfidence } from './distributions';
import { METHODS } from './methods';
import { NoncentralHypergeometric } from './noncentral-hypergeometric';
import { nullInterval, undefinedBecause, type Interval, type Reason } from './result-types';
import { increasingRoot } from './root-finding';
import { margins, type TwoByTwo, validateTable } from './two-by-two';
import { assertConfidence } from './validation';

export interface OddsRatioResult {
  estimate: number | null;
  woolf: Interval;
  exact: { estimate: number | null; lower: number | null; upper: number | null };
  confidence: number;
  methods: { woolf: string; exact: string };
  reasons: Reason[];
}

/**
 * Exact conditional odds ratio: CMLE and exact limits. Gives 0 or ∞ at the end of the support
 * where a lies, and is undefined only when the margins allow a single table.
 *
 * @example
 * exactConditionalOddsRatio({ a: 5, b: 51, c: 0, d: 29 }, 0.95) // { estimate: Infinity, lower: 0.48327150104200445, upper: Infinity }
 */
export function exactConditionalOddsRatio(t: TwoByTwo, confidence: number, reasons: Reason[] = []): OddsRatioResult['exact'] {
  const { n1, n0, m1 } = margins(t);
  const dist = new NoncentralHypergeometric(n1, n0, m1);
  if (dist.lo === dist.hi) {
    const why = 'the margins allow only one table (an empty group or no events/non-events at all)';
    for (const f of ['exact.estimate', 'exact.lower', 'exact.upper']) undefinedBecause(reasons, f, why);
    return { estimate: null, lower: null, upper: null };
  }
  const halfAlpha = (1 - confidence) / 2;
  const { a } = t;
  const start = Math.log(((t.a + 0.5) * (t.d + 0.5)) / ((t.b + 0.5) * (t.c + 0.5)));
  const atLo = a === dist.lo;
  const atHi = a === dist.hi;
  const estimate = atLo ? 0 : atHi ? Infinity : Math.exp(increasingRoot((s) => dist.mean(s) - a, start));
  const lower = atLo ? 0 : Math.exp(increasingRoot((s) => dist.upperTail(a, s) - halfAlpha, start));
  const upper = atHi ? Infinity : Math.exp(increasingRoot((s) => halfAlpha - dist.lowerTail(a, s), start));
  return { estimate, lower, upper };
}

/**
 * Odds ratio with the Woolf and exact conditional intervals.
 *
 * @example
 * oddsRatio({ a: 56, b: 14, c: 48, d: 32 }).woolf // { lower: 1.276217870536434, upper: 5.572019696074379 }
 */
export function oddsRatio(t: TwoByTwo, confidence = 0.95): OddsRatioResult {
  validateTable(t);
  assertConfidence(confidence);
  const methods = { woolf: METHODS.orWoolf, exact: METHODS.orExact };
  const reasons: Reason[] = [];
  const { a, b, c, d } = t;
  const ad = a * d;
  const bc = b * c;
  let estimate: number | null;
  if (ad === 0 && bc === 0) estimate = undefinedBecause(reasons, 'estimate', 'ad = bc = 0: the odds ratio is 0/0');
  else if (bc === 0) estimate = Infinity;
  else estimate = ad / bc; // OR = ad/bc
  let woolf: Interval = nullInterval();
  if (a === 0 || b === 0 || c === 0 || d === 0) undefinedBecause(reasons, 'woolf', 'a zero cell (log of 0)');
  else {
    const z = zForConfidence(confidence);
    const se = Math.sqrt(1 / a + 1 / b + 1 / c + 1 / d); // Woolf 1955
    const or = estimate as number;
    woolf = { lower: or * Math.exp(-z * se), upper: or * Math.exp(z * se) };
  }
  const exact = exactConditionalOddsRatio(t, confidence, reasons);
  return { estimate, woolf, exact, confidence, methods, reasons };
}

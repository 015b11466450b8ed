/**
 * Wilson score interval for a single proportion x/n (Wilson EB. J Am Stat Assoc 1927;22:209–12),
 * the building block of Newcombe's hybrid-score interval for a risk difference.
 * limits = [2x + z² ± z√(z² + 4x(n − x)/n)] / [2(n + z²)].
 *
 * @example
 * wilsonInterval(0, 10, 0.95) // { lower: 0, upper: 0.2775327998628892 }
 */
import { zForConfidence } from './distributions';
import { assertConfidence, assertCount, assertCasesWithinTotal, StatsValidationError } from './validation';

/**
 * Wilson score limits for x successes in n > 0 trials.
 *
 * @example
 * wilsonInterval(10, 10, 0.95) // { lower: 0.7224672001371107, upper: 1 }
 */
export function wilsonInterval(x: number, n: number, confidence: number): { lower: number; upper: number } {
  assertCount('x', x);
  assertCount('n', n);
  assertCasesWithinTotal('x', x, n);
  assertConfidence(confidence);
  if (n === 0) throw new StatsValidationError([{ path: 'n', message: 'a proportion needs at least one trial' }]);
  const z = zForConfidence(confidence);
  const z2 = z * z;
  const centre = 2 * x + z2;
  const half = z * Math.sqrt(z2 + (4 * x * (n - x)) / n); // Wilson 1927
  const denom = 2 * (n + z2);
  // At x = 0 and x = n the formula gives exactly 0 and 1 in exact arithmetic; pin them.
  const lower = x === 0 ? 0 : (centre - half) / denom;
  const upper = x === n ? 1 : (centre + half) / denom;
  return { lower, upper };
}

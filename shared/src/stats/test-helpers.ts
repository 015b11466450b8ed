/**
 * Test helper: relative closeness with an explicit tolerance, shared by the tests of the core.
 *
 * @example
 * expectRelClose(1.0000001, 1, 1e-6) // passes
 */
import { expect } from 'vitest';

/** |actual − expected| ≤ rel·|expected| (or ≤ abs when expected is 0). */
export function expectRelClose(actual: number | null | undefined, expected: number, rel: number, abs = 1e-12): void {
  expect(typeof actual, `expected a number, got ${String(actual)}`).toBe('number');
  const allowed = Math.max(abs, rel * Math.abs(expected));
  expect(Math.abs((actual as number) - expected), `${String(actual)} vs ${expected} (±${allowed})`).toBeLessThanOrEqual(allowed);
}

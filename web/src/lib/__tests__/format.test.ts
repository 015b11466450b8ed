import { describe, expect, it } from 'vitest';
import { formatAmount, formatEstimate, formatInterval } from '../format';

// The web app's names for the one rule (shared/src/number-format.test.ts holds the rule's own cases);
// expected strings written out by hand from the rule.
describe('number formatting on screen', () => {
  it('formats estimates, amounts and intervals by the shared rule', () => {
    expect(formatEstimate(0.460690303)).toBe('0.461');
    expect(formatEstimate(6)).toBe('6');
    expect(formatAmount(22050)).toBe('22,050');
    expect(formatAmount(12.3456)).toBe('12.3');
    expect(formatInterval({ lower: 1.832711715, upper: Infinity })).toBe('1.83 to ∞');
  });
});

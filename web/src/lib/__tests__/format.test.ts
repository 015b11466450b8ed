import { describe, expect, it } from 'vitest';
import { formatEstimate, formatInterval, formatP, formatPercent } from '../format';

// Expected strings written out by hand from the rounding rules (common practice: round half away from zero).
describe('number formatting', () => {
  it.each([
    [0.460690303, '0.4607'],
    [1.855758658, '1.856'],
    [-7.220370326, '-7.220'],
    [6, '6.000'],
    [11.2252538, '11.23'],
    [0, '0'],
    [Infinity, '∞'],
    [null, 'not defined'],
    [127650, '127,650'],
  ])('formatEstimate(%s) = %s', (x, s) => {
    expect(formatEstimate(x)).toBe(s);
  });

  it('formats an interval with its undefined limits spelled out', () => {
    expect(formatInterval({ lower: 1.832711715, upper: Infinity })).toBe('1.833 to ∞');
    expect(formatInterval({ lower: null, upper: null })).toBe('not defined to not defined');
  });

  it.each([
    [0.04046380731, '0.0405'],
    [0.5, '0.5'],
    [3.3e-22, '< 0.0001'],
    [1, '1'],
  ])('formatP(%s) = %s', (p, s) => {
    expect(formatP(p)).toBe(s);
  });

  it('formats fractions as percentages', () => {
    expect(formatPercent(0.7504701619)).toBe('75.05%');
  });
});

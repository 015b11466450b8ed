import { describe, expect, it } from 'vitest';
import { formatCount, formatFigure, formatInterval, formatP, formatPercent } from './number-format';

// Expected strings written out by hand from the rule (three significant digits, round half away
// from zero as in common practice, no trailing zeros, grouping; whole numbers from 1,000 up).
describe('the number rule', () => {
  it.each([
    [0.460690303, '0.461'],
    [1.855758658, '1.86'],
    [-7.220370326, '-7.22'],
    [6, '6'],
    [1.8, '1.8'],
    [11.2252538, '11.2'],
    [254.49, '254'],
    [999.6, '1,000'],
    [127650, '127,650'],
    [1234.5, '1,235'],
    [0.03125, '0.0313'],
    [0.0000123456, '0.0000123'],
    [0, '0'],
    [Infinity, '∞'],
    [-Infinity, '−∞'],
    [null, 'not defined'],
    [Number.NaN, 'not defined'],
  ])('formatFigure(%s) = %s', (x, s) => {
    expect(formatFigure(x)).toBe(s);
  });

  it('never prints more than three significant digits below 1,000', () => {
    for (const x of [0.03125, 0.0625, 0.125, 1 / 3, 2 / 3, 12.3456, 987.654, 0.00098765]) {
      const digits = formatFigure(x)
        .replace(/[^0-9]/g, '')
        .replace(/^0+/, '');
      expect(digits.length, `${x} → ${formatFigure(x)}`).toBeLessThanOrEqual(3);
    }
  });

  it('spells out an interval with its undefined limits', () => {
    expect(formatInterval({ lower: 1.832711715, upper: Infinity })).toBe('1.83 to ∞');
    expect(formatInterval({ lower: null, upper: 2 })).toBe('not defined to 2');
  });

  it.each([
    [0.04046380731, '0.0405'],
    [0.5, '0.5'],
    [3.3e-22, '< 0.0001'],
    [1, '1'],
  ])('formatP(%s) = %s', (p, s) => {
    expect(formatP(p)).toBe(s);
  });

  it('formats counts whole and fractions as percentages', () => {
    expect(formatCount(1709)).toBe('1,709');
    expect(formatPercent(0.7504701619)).toBe('75%');
    expect(formatPercent(0.12345)).toBe('12.3%');
  });
});

import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { addMonths, monthIndex, monthIso, monthsBetween } from './months';

// Reference: the ECMAScript Date's own calendar arithmetic in UTC (Date.UTC normalises a month
// out of 0–11 into the adjacent years; ECMA-262 §21.4.1.28 MakeDay), a general-purpose library
// independent of the integer formulas under test.
const byDate = (month: string, n: number) => {
  const d = new Date(Date.UTC(Number(month.slice(0, 4)), Number(month.slice(5, 7)) - 1 + n, 1));
  return d.toISOString().slice(0, 10);
};
const isoMonth = fc
  .record({ y: fc.integer({ min: 1000, max: 9000 }), m: fc.integer({ min: 1, max: 12 }) })
  .map(({ y, m }) => `${y}-${String(m).padStart(2, '0')}-01`);

describe('month arithmetic', () => {
  it.each([
    ['2025-01-01', -1, '2024-12-01'],
    ['2024-12-01', 13, '2026-01-01'],
    ['2024-03-15', 0, '2024-03-01'],
    ['2024-01-01', -25, '2021-12-01'],
  ])('addMonths(%s, %i) is %s (by hand)', (month, n, expected) => {
    expect(addMonths(month, n)).toBe(expected);
  });

  it('agrees with the UTC Date arithmetic for any month and offset', () => {
    fc.assert(fc.property(isoMonth, fc.integer({ min: -600, max: 600 }), (month, n) => addMonths(month, n) === byDate(month, n)));
  });

  it('monthIso inverts monthIndex, and the index counts months', () => {
    fc.assert(
      fc.property(isoMonth, fc.integer({ min: -600, max: 600 }), (month, n) => {
        expect(monthIso(monthIndex(month))).toBe(month);
        expect(monthsBetween(month, byDate(month, n))).toBe(n);
      }),
    );
    expect(monthIndex('2024-03')).toBe(2024 * 12 + 2);
  });
});

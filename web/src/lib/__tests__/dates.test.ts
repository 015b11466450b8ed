import { describe, expect, it } from 'vitest';
import { formatDuration, formatMonth } from '../dates';
import { toNumber } from '../json-number';

describe('dates and JSON numbers', () => {
  it.each([
    ['2024-03-01', 'Mar 2024'],
    ['2020-12-01', 'Dec 2020'],
  ])('formats the month %s as %s, whatever the time zone', (iso, text) => {
    expect(formatMonth(iso)).toBe(text);
  });

  it('formats durations in seconds and minutes, and says when a run is still going', () => {
    expect(formatDuration('2024-01-01T00:00:00Z', '2024-01-01T00:00:12.34Z')).toBe('12.3 s');
    expect(formatDuration('2024-01-01T00:00:00Z', '2024-01-01T00:04:05Z')).toBe('4 min 05 s');
    expect(formatDuration('2024-01-01T00:00:00Z', null)).toBe('still running');
  });

  it("reads the API's infinities back as numbers", () => {
    expect(toNumber('Infinity')).toBe(Infinity);
    expect(toNumber('-Infinity')).toBe(-Infinity);
    expect(toNumber(null)).toBeNull();
    expect(toNumber(1.5)).toBe(1.5);
  });
});

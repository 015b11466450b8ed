import { describe, expect, it } from 'vitest';
import { PeriodBook } from './periods';
import { isWindowEnd, monthIndex, monthIso, offeredWindows, windowContextOf, windowLabel, windowMonths } from './windows';

/** Calendar quarters and years by their usual definition (common practice: Q1 = January–March … Q4 = October–December). */
describe('analysis windows', () => {
  const none = { wholeStart: null };

  it('month indices run on across years and back', () => {
    expect(monthIndex('2025-01-01') - monthIndex('2024-12-01')).toBe(1);
    expect(monthIso(monthIndex('2031-07-01'))).toBe('2031-07-01');
  });

  it('a single month and the rolling twelve months end at every month', () => {
    expect(windowMonths('month', '2025-05-01')).toEqual(['2025-05-01']);
    const r = windowMonths('rolling12', '2025-03-01');
    expect(r).toHaveLength(12);
    expect([r[0], r[11]]).toEqual(['2024-04-01', '2025-03-01']);
  });

  it('calendar quarters end in March, June, September and December and hold their three months', () => {
    const ends = Array.from({ length: 12 }, (_, i) => monthIso(monthIndex('2025-01-01') + i)).filter((p) => isWindowEnd('quarter', p, none));
    expect(ends).toEqual(['2025-03-01', '2025-06-01', '2025-09-01', '2025-12-01']);
    expect(windowMonths('quarter', '2025-06-01')).toEqual(['2025-04-01', '2025-05-01', '2025-06-01']);
    expect(windowMonths('quarter', '2025-12-01')).toEqual(['2025-10-01', '2025-11-01', '2025-12-01']);
    expect(windowMonths('quarter', '2025-05-01')).toEqual([]);
  });

  it('a calendar year ends in December and holds the same months as the rolling twelve months ending there', () => {
    expect(isWindowEnd('year', '2025-11-01', none)).toBe(false);
    expect(windowMonths('year', '2025-12-01')).toEqual(windowMonths('rolling12', '2025-12-01'));
    expect(windowMonths('year', '2025-12-01')[0]).toBe('2025-01-01');
  });

  it('the whole period runs from its start to each month from the start on, and not without a start', () => {
    const ctx = { wholeStart: '2024-11-01' };
    expect(windowMonths('whole', '2024-10-01', ctx)).toEqual([]);
    expect(windowMonths('whole', '2024-11-01', ctx)).toEqual(['2024-11-01']);
    expect(windowMonths('whole', '2025-02-01', ctx)).toEqual(['2024-11-01', '2024-12-01', '2025-01-01', '2025-02-01']);
    expect(windowMonths('whole', '2025-02-01', none)).toEqual([]);
  });

  it('the windows a settings version offers: the month always; absent, month and rolling 12; the whole period only with a start', () => {
    expect(offeredWindows({})).toEqual(['month', 'rolling12']);
    expect(offeredWindows({ windows: ['year', 'quarter'] })).toEqual(['month', 'quarter', 'year']);
    expect(offeredWindows({ windows: ['month', 'whole'] })).toEqual(['month']);
    expect(offeredWindows({ windows: ['whole', 'month'], wholePeriodStart: '2024-01-01' })).toEqual(['month', 'whole']);
    expect(windowContextOf({ windows: ['quarter'], wholePeriodStart: '2024-01-01' })).toEqual({ wholeStart: null });
    expect(windowLabel('whole', { wholeStart: '2024-01-01' })).toBe('Whole period from 2024-01');
  });

  it('a quarter, a year or a whole period is complete only when each of its months is (shared/src/periods.ts)', () => {
    // Site 1 ready January–June 2025 except April (hours in, cases awaited).
    const months = ['2025-01-01', '2025-02-01', '2025-03-01', '2025-04-01', '2025-05-01', '2025-06-01'];
    const book = new PeriodBook(months.map((m) => ({ siteId: 1, month: m, state: m === '2025-04-01' ? 'hours_in' : 'ready', roster: true })));
    expect(book.completeness('quarter', '2025-03-01')).toBe('complete');
    expect(book.completeness('quarter', '2025-06-01')).toBe('partial');
    expect(book.completeness('whole', '2025-03-01', null, { wholeStart: '2025-01-01' })).toBe('complete');
    expect(book.completeness('whole', '2025-06-01', null, { wholeStart: '2025-01-01' })).toBe('partial');
    expect(book.completeness('whole', '2025-06-01', null, { wholeStart: '2025-05-01' })).toBe('complete');
  });
});

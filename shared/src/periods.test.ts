import { describe, expect, it } from 'vitest';
import { addMonths, PeriodBook, periodStateOf, windowMonths, type PeriodState } from './periods';

// The completeness rules are Ratewarden's own (shared/src/periods.ts); these cases pin them down.
const book = (rows: [number, string, PeriodState][]) => new PeriodBook(rows.map(([siteId, month, state]) => ({ siteId, month, state })));

describe('reporting periods', () => {
  it('decides the state from what was received', () => {
    expect(periodStateOf({ roster: false, cases: false, closed: false })).toBe('awaiting');
    expect(periodStateOf({ roster: true, cases: false, closed: false })).toBe('hours_in');
    expect(periodStateOf({ roster: false, cases: true, closed: false })).toBe('cases_in');
    expect(periodStateOf({ roster: true, cases: true, closed: false })).toBe('ready');
    expect(periodStateOf({ roster: true, cases: true, closed: true })).toBe('closed');
  });

  it('does month arithmetic across years', () => {
    expect(addMonths('2025-01-01', -1)).toBe('2024-12-01');
    expect(addMonths('2024-12-01', 13)).toBe('2026-01-01');
    expect(windowMonths('rolling12', '2025-03-01')).toEqual([
      '2024-04-01',
      '2024-05-01',
      '2024-06-01',
      '2024-07-01',
      '2024-08-01',
      '2024-09-01',
      '2024-10-01',
      '2024-11-01',
      '2024-12-01',
      '2025-01-01',
      '2025-02-01',
      '2025-03-01',
    ]);
  });

  it('calls a company month complete only when every expected site is', () => {
    const b = book([
      [1, '2025-06-01', 'ready'],
      [2, '2025-06-01', 'ready'],
      [1, '2025-07-01', 'ready'],
      [2, '2025-07-01', 'hours_in'],
    ]);
    expect(b.monthComplete('2025-06-01')).toBe(true);
    expect(b.monthComplete('2025-07-01')).toBe(false);
    expect(b.monthComplete('2025-07-01', [1])).toBe(true);
    expect(b.completeness('month', '2025-07-01')).toBe('partial');
  });

  it('expects a site that reported in the last 12 months, not one silent for longer', () => {
    const b = book([
      [1, '2023-01-01', 'closed'],
      [2, '2024-06-01', 'ready'],
      [3, '2024-06-01', 'cases_in'],
    ]);
    expect(b.expectedSites('2024-06-01')).toEqual([2]);
    expect(b.expectedSites('2023-12-01')).toEqual([1]);
    expect(b.monthComplete('2024-06-01')).toBe(true);
  });

  it('calls a rolling window partial when one of its months is, and ignores months before the data', () => {
    const first: [number, string, PeriodState][] = Array.from({ length: 6 }, (_, i) => [1, addMonths('2025-01-01', i), 'ready']);
    expect(book(first).windowComplete('rolling12', '2025-06-01')).toBe(true);
    const gap = first.map((r): [number, string, PeriodState] => (r[1] === '2025-03-01' ? [1, r[1], 'hours_in'] : r));
    expect(book(gap).windowComplete('rolling12', '2025-06-01')).toBe(false);
    expect(book(gap).windowComplete('month', '2025-06-01')).toBe(true);
  });
});

describe('latest complete month', () => {
  it('is the newest month each expected site of the scope has complete', () => {
    const b = book([
      [1, '2025-06-01', 'closed'],
      [2, '2025-06-01', 'ready'],
      [1, '2025-07-01', 'ready'],
      [2, '2025-07-01', 'hours_in'],
      [1, '2025-08-01', 'hours_in'],
      [2, '2025-08-01', 'awaiting'],
    ]);
    expect(b.latestComplete()).toBe('2025-06-01');
    expect(b.latestComplete([1])).toBe('2025-07-01');
    expect(b.latestComplete([2])).toBe('2025-06-01');
    expect(book([[1, '2025-01-01', 'hours_in']]).latestComplete()).toBeNull();
  });

  it('does not expect a site whose only month in the last year was closed without a roster', () => {
    const b = new PeriodBook([
      { siteId: 1, month: '2025-03-01', state: 'ready', roster: true },
      { siteId: 2, month: '2025-02-01', state: 'closed', roster: false },
      { siteId: 2, month: '2025-03-01', state: 'awaiting', roster: false },
    ]);
    expect(b.expectedSites('2025-03-01')).toEqual([1]);
    expect(b.monthComplete('2025-03-01')).toBe(true);
    // A closed month with its roster keeps its site expected.
    const c = new PeriodBook([
      { siteId: 1, month: '2025-03-01', state: 'ready', roster: true },
      { siteId: 2, month: '2025-02-01', state: 'closed', roster: true },
      { siteId: 2, month: '2025-03-01', state: 'awaiting', roster: false },
    ]);
    expect(c.monthComplete('2025-03-01')).toBe(false);
  });

  it('does not expect a retired site after its retirement, and keeps the months it was expected in', () => {
    // Site 2 rostered in June and July, retired in July: August is complete with site 1 alone.
    const b = new PeriodBook([
      { siteId: 1, month: '2025-07-01', state: 'ready' },
      { siteId: 2, month: '2025-07-01', state: 'hours_in' },
      { siteId: 1, month: '2025-08-01', state: 'ready' },
      { siteId: 2, month: '2025-08-01', state: 'awaiting', retired: true },
    ]);
    expect(b.expectedSites('2025-08-01')).toEqual([1]);
    expect(b.monthComplete('2025-08-01')).toBe(true);
    expect(b.monthComplete('2025-07-01')).toBe(false);
    expect(b.windowComplete('rolling12', '2025-08-01')).toBe(false);
    // Without the retirement, site 2 would still be expected in August.
    expect(
      new PeriodBook([
        { siteId: 1, month: '2025-08-01', state: 'ready' },
        { siteId: 2, month: '2025-07-01', state: 'hours_in' },
        { siteId: 2, month: '2025-08-01', state: 'awaiting' },
      ]).monthComplete('2025-08-01'),
    ).toBe(false);
  });
});

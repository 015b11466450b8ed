import { describe, expect, it } from 'vitest';
import type { Cell } from '../runs/cells-query';
import { disclosureFrame } from './disclosure-frame';

/** One cell: outcome 1, group `g`, site `s`, month `m` (2030-01 + m), `cases` cases, 100 h. */
const cell = (g: number, s: number, m: number, cases: number, age: number | null = 30, sex: string | null = 'F'): Cell => ({
  outcomeId: 1,
  groupId: g,
  siteId: s,
  month: `20${30 + Math.floor(m / 12)}-${String((m % 12) + 1).padStart(2, '0')}-01`,
  ageBand: age,
  sex,
  cents: 10_000,
  cases,
});

const pick = (frame: ReturnType<typeof disclosureFrame>, f: Partial<(typeof frame)[number]>) =>
  frame.filter((w) => Object.entries(f).every(([k, v]) => w[k as keyof typeof w] === v));

describe('the disclosure frame of a run (worked out by hand)', () => {
  it('a group with no small month anywhere is shown whole; its stratum tables only in calendar years', () => {
    const cells = Array.from({ length: 24 }, (_, m) => [cell(1, 1, m, 6), cell(1, 2, m, 0)]).flat();
    const frame = disclosureFrame(cells, 5);
    expect(frame.filter((w) => !w.window.startsWith('strata'))).toEqual([]);
    // Tables at every rolling window but those ending in December (2031, 2030) are withheld.
    const age = pick(frame, { window: 'strata_age' });
    expect(age.length).toBe(22);
    expect(age.map((w) => w.period)).not.toContain('2031-12-01');
    expect(age.map((w) => w.period)).not.toContain('2030-12-01');
  });

  it('a small month: single months, the series and the overlapping windows withheld; calendar years shown', () => {
    // Site 1: 6 a month but 3 in month 5; site 2: nothing. 24 months, 2030 and 2031: calendar years end in months 11 and 23.
    const cells = Array.from({ length: 24 }, (_, m) => cell(1, 1, m, m === 5 ? 3 : 6));
    cells.push(cell(1, 2, 0, 0));
    const frame = disclosureFrame(cells, 5);
    expect(pick(frame, { siteId: null, window: 'month' }).length).toBe(24);
    expect(pick(frame, { siteId: null, window: 'series', reason: 'months' }).length).toBe(1);
    const rolling = pick(frame, { siteId: null, window: 'rolling12' }).map((w) => w.period);
    expect(rolling.length).toBe(22);
    expect(rolling).not.toContain('2031-12-01');
    expect(rolling).not.toContain('2030-12-01');
    // The calendar years hold 69 and 72 cases: shown, nothing small in them.
    expect(frame.some((w) => w.reason === 'small' || w.reason === 'complement')).toBe(false);
  });

  it('the year in progress is not shown, and the windows do not move from one run to the next', () => {
    // 2030 and the first five months of 2031, a small month in 2031: only December 2030 is shown.
    const upTo = (months: number) => Array.from({ length: months }, (_, m) => cell(1, 1, m, m === 13 ? 2 : 6));
    const shown = (months: number) => {
      const withheld = new Set(pick(disclosureFrame(upTo(months), 5), { siteId: null, window: 'rolling12' }).map((w) => w.period));
      return Array.from({ length: months }, (_, m) => cell(1, 1, m, 0).month).filter((p) => !withheld.has(p));
    };
    expect(shown(17)).toEqual(['2030-12-01']);
    // A month later the same window, and only it: nothing to difference against the run before.
    expect(shown(18)).toEqual(['2030-12-01']);
    expect(shown(24)).toEqual(['2030-12-01', '2031-12-01']);
  });

  it('in a yearly window the sites add up to the company: a small site gets its complement, the shown company stays', () => {
    // December only (the calendar year 2030): sites 3, 7, 12 with a small month at site 1.
    const frame = disclosureFrame([cell(1, 1, 11, 3), cell(1, 2, 11, 7), cell(1, 3, 11, 12)], 5);
    const rolling = pick(frame, { window: 'rolling12' });
    expect(rolling).toEqual([
      { siteId: 1, outcomeId: 1, exposureGroupId: 1, window: 'rolling12', period: '2030-12-01', reason: 'small' },
      { siteId: 2, outcomeId: 1, exposureGroupId: 1, window: 'rolling12', period: '2030-12-01', reason: 'complement' },
    ]);
  });

  it('a company total that would narrow its small sites whatever is withheld beside them: with its months shown, the sites go unlabelled', () => {
    // 4 + 4 = 8: each "<5" would have to be 4. The company's month (8) is not small and is shown.
    const frame = disclosureFrame([cell(1, 1, 11, 4), cell(1, 2, 11, 4)], 5);
    expect(pick(frame, { window: 'rolling12' }).map((w) => [w.siteId, w.reason])).toEqual([
      [1, 'months'],
      [2, 'months'],
    ]);
    expect(pick(frame, { siteId: null, window: 'rolling12' })).toEqual([]);
    // With a small company month (2 + 2), the company's yearly count is withheld in its own right.
    const small = disclosureFrame([cell(1, 1, 11, 2), cell(1, 2, 11, 2)], 5);
    expect(pick(small, { siteId: null, window: 'rolling12' }).map((w) => w.reason)).toEqual(['small']);
  });

  it('a yearly stratum table holding a small count is withheld; the rest of its yearly tables stand', () => {
    const cells = Array.from({ length: 12 }, (_, m) => [cell(1, 1, m, 1, 30, 'F'), cell(1, 1, m, 5, 40, 'M')]).flat();
    cells.push(cell(1, 1, 11, 2, 50, 'M')); // 2 in the 50s: small in the yearly table by age; by sex M = 62, F = 12
    const frame = disclosureFrame(cells, 5);
    expect(pick(frame, { window: 'strata_age', period: '2030-12-01' }).length).toBe(1);
    expect(pick(frame, { window: 'strata_sex', period: '2030-12-01' })).toEqual([]);
  });
});

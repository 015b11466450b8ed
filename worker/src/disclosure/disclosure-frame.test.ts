import { describe, expect, it } from 'vitest';
import type { Cell } from '../runs/cells-query';
import { monthIndex, windowStartIndex } from '@ratewarden/shared/windows';
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

describe('the disclosure frame of the calendar quarter, calendar year and whole-period windows', () => {
  const all = { windows: ['month', 'rolling12', 'quarter', 'year', 'whole'] as const, wholePeriodStart: '2030-04-01' };
  const offered = { windows: [...all.windows], wholePeriodStart: all.wholePeriodStart };

  it('a scope without small months shows every window; only the windows offered are framed', () => {
    const cells = Array.from({ length: 24 }, (_, m) => [cell(1, 1, m, 6), cell(1, 2, m, 0)]).flat();
    expect(disclosureFrame(cells, 5, offered).filter((w) => !w.window.startsWith('strata'))).toEqual([]);
    // A small month, with the default windows: nothing of quarters or whole periods is listed.
    const small = Array.from({ length: 24 }, (_, m) => cell(1, 1, m, m === 5 ? 3 : 6));
    const legacy = disclosureFrame(small, 5);
    expect(legacy.some((w) => w.window === 'quarter' || w.window === 'whole' || w.window === 'year')).toBe(false);
  });

  it('a small month: every quarter and every whole-period end of the scope is withheld; the calendar year exactly as the rolling 12 in December', () => {
    // Site 1: 6 a month but 3 in month 5 (June 2030); site 2: 7 a month. 24 months.
    const cells = Array.from({ length: 24 }, (_, m) => [cell(1, 1, m, m === 5 ? 3 : 6), cell(1, 2, m, 7)]).flat();
    const frame = disclosureFrame(cells, 5, offered);
    // The company's months (13, and 10 in June) are none small: its quarters and whole periods are shown, like its months.
    expect(pick(frame, { siteId: null }).filter((w) => w.window === 'quarter' || w.window === 'whole')).toEqual([]);
    // Both sites' are withheld (with the company's months, one site's would give the other's back).
    for (const siteId of [1, 2]) {
      expect(pick(frame, { siteId, window: 'quarter' }).map((w) => [w.period, w.reason])).toEqual(
        ['2030-03-01', '2030-06-01', '2030-09-01', '2030-12-01', '2031-03-01', '2031-06-01', '2031-09-01', '2031-12-01'].map((p) => [p, 'months']),
      );
      // Whole period from April 2030: its 21 ends, April 2030 to December 2031.
      expect(pick(frame, { siteId, window: 'whole', reason: 'months' }).length).toBe(21);
    }
    const decemberRolling = frame.filter((w) => w.window === 'rolling12' && w.period!.endsWith('-12-01')).map(({ window: _w, ...rest }) => rest);
    const years = frame.filter((w) => w.window === 'year').map(({ window: _w, ...rest }) => rest);
    expect(years).toEqual(decemberRolling);
  });

  it('the calendar year carries the margins of the rolling 12 in December: a small site and its complement', () => {
    const frame = disclosureFrame([cell(1, 1, 11, 3), cell(1, 2, 11, 7), cell(1, 3, 11, 12)], 5, offered);
    expect(pick(frame, { window: 'year' }).map((w) => [w.siteId, w.period, w.reason])).toEqual([
      [1, '2030-12-01', 'small'],
      [2, '2030-12-01', 'complement'],
    ]);
  });

  /**
   * An attacker who reads every window of every scope together, shown counts as exact values, and
   * knows the sites add up to the company: no small month may lie in the span of what is shown
   * (Gaussian elimination over the site × month unknowns). The frame of the month and rolling-12
   * windows alone is the baseline; with every rolling window shown the attack must find months.
   */
  function recoveredMonths(cells: Cell[], showAllRolling = false): string[] {
    const frame = disclosureFrame(cells, 5, offered);
    const withheld = new Set(frame.map((w) => `${w.siteId ?? 'all'}|${w.window}|${w.period}`));
    const sites = [...new Set(cells.map((c) => c.siteId))].sort();
    const months = [...new Set(cells.map((c) => c.month))].sort();
    const n = sites.length * months.length;
    const truth = new Map(cells.map((c) => [`${c.siteId}|${c.month}`, c.cases]));
    const count = (v: number[]) => v.reduce((a, x, i) => a + x * (truth.get(`${sites[Math.floor(i / months.length)]}|${months[i % months.length]}`) ?? 0), 0);
    const vector = (siteId: number | null, from: number, to: number) => {
      const v = new Array<number>(n).fill(0);
      sites.forEach((s, si) => {
        if (siteId !== null && s !== siteId) return;
        for (let m = Math.max(from, 0); m <= to; m++) v[si * months.length + m] = 1;
      });
      return v;
    };
    // The shown rows: each window end, each scope, not withheld and not small.
    const basis: number[][] = [];
    const reduce = (v: number[]) => {
      const r = [...v];
      for (const b of basis) {
        const pivot = b.findIndex((x) => Math.abs(x) > 1e-9);
        if (Math.abs(r[pivot]!) > 1e-9) {
          const f = r[pivot]! / b[pivot]!;
          for (let i = 0; i < n; i++) r[i]! -= f * b[i]!;
        }
      }
      return r;
    };
    const add = (v: number[]) => {
      const r = reduce(v);
      if (r.some((x) => Math.abs(x) > 1e-9)) {
        const pivot = r.findIndex((x) => Math.abs(x) > 1e-9);
        for (const b of basis) {
          if (Math.abs(b[pivot]!) > 1e-9) {
            const f = b[pivot]! / r[pivot]!;
            for (let i = 0; i < n; i++) b[i]! -= f * r[i]!;
          }
        }
        basis.push(r);
      }
    };
    const first = monthIndex(months[0]!);
    const ctx = { wholeStart: offered.wholePeriodStart };
    for (const siteId of [null, ...sites]) {
      for (let p = 0; p < months.length; p++) {
        for (const kind of offered.windows) {
          const start = windowStartIndex(kind, first + p, ctx);
          if (start === null) continue;
          const v = vector(siteId, start - first, p);
          const c = count(v);
          const shown =
            showAllRolling && kind === 'rolling12' ? c === 0 || c >= 5 : !withheld.has(`${siteId ?? 'all'}|${kind}|${months[p]}`) && (c === 0 || c >= 5);
          if (shown) add(v);
        }
      }
    }
    const out: string[] = [];
    for (const siteId of [null, ...sites]) {
      for (let p = 0; p < months.length; p++) {
        const v = vector(siteId, p, p);
        const c = count(v);
        if (c >= 1 && c <= 4 && reduce(v).every((x) => Math.abs(x) < 1e-9)) out.push(`${siteId ?? 'all'}|${months[p]}`);
      }
    }
    return out;
  }

  it('an attacker reading every window and scope together recovers no small month (and would, were the rolling windows all shown)', () => {
    // Two sites over 2030–2031, seeded counts with small months scattered, one site with none.
    let seed = 7;
    const rnd = () => (seed = (seed * 16807) % 2147483647) / 2147483647;
    const cells = Array.from({ length: 24 }, (_, m) => [
      cell(1, 1, m, rnd() < 0.3 ? 1 + Math.floor(rnd() * 4) : 5 + Math.floor(rnd() * 6)),
      cell(1, 2, m, 6 + (m % 3)),
    ]).flat();
    expect(cells.some((c) => c.cases >= 1 && c.cases <= 4)).toBe(true);
    expect(recoveredMonths(cells)).toEqual([]);
    expect(recoveredMonths(cells, true).length).toBeGreaterThan(0);
    // Sparse counts: the company's months are small too, and the calendar years carry margins.
    const sparse = Array.from({ length: 24 }, (_, m) => [cell(1, 1, m, Math.floor(rnd() * 3)), cell(1, 2, m, m % 4 === 0 ? 2 : 0), cell(1, 3, m, 5)]).flat();
    expect(sparse.some((c) => c.siteId !== 3 && c.cases >= 1 && c.cases <= 4)).toBe(true);
    expect(recoveredMonths(sparse)).toEqual([]);
    expect(recoveredMonths(sparse, true).length).toBeGreaterThan(0);
  });
});

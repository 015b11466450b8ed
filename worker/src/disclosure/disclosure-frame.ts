import { isSmallCount, marginSuppression, type Withheld } from '@ratewarden/shared/small-cells';
import type { Cell } from '../runs/cells-query';
import { offeredWindows, windowContextOf, windowStartIndex, type WindowKind, type WindowSettings } from '@ratewarden/shared/windows';
import { monthIndex, monthIso } from '@ratewarden/shared/months';
import { MonthSeries } from './month-series';

/** Why a count is kept from readers other than the physician (see disclosureFrame). */
export type FrameReason = Withheld | 'months' | 'strata';

/** One count a run withholds from every reader but the physician (a row of run_withheld). */
export interface WithheldCount {
  siteId: number | null;
  outcomeId: number;
  exposureGroupId: number;
  /** An analysis window (shared/src/windows.ts) or series (the total behind the u-chart); strata_age / strata_sex: the company's stratum table. */
  window: WindowKind | 'series' | 'strata_age' | 'strata_sex';
  /** First day of the window's last month; null for the series. */
  period: string | null;
  reason: FrameReason;
}

const STRATA = { age: (c: Cell) => (c.ageBand === null ? '' : String(c.ageBand)), sex: (c: Cell) => c.sex ?? '' } as const;
const STRATA_WINDOW = { age: 'strata_age', sex: 'strata_sex' } as const;

/**
 * The run's disclosure frame: every count that readers other than the physician may not see,
 * decided once per run from its cells, so that every table, flag and notice applies one pattern
 * and nothing they can read together narrows a withheld count beyond what its label says (zero;
 * small, 1 … threshold − 1; a complement, threshold or more; or "months", anything). Per
 * outcome × exposure group and scope (the company, each site):
 *
 * - A scope whose single months are all 0 or at least the threshold is shown whole: every sum of
 *   such counts is 0 or at least the threshold too.
 * - Otherwise its single months, series total (behind the u-chart) and most rolling windows would
 *   give the small months back by difference (month m = R12(m) − R12(m − 1) + month(m − 12)), so
 *   those readers get its rolling twelve months only where they end in December: calendar years
 *   ("yearly windows"), disjoint, so no difference of two is a month, and the same in every run,
 *   so neither is a difference of this run's window and the last run's (a window ending at the
 *   latest month would move a month each run). The year in progress is not shown; the first year
 *   of the data may hold fewer than twelve months. The calendar-year window holds the same months
 *   as the rolling twelve months ending in December and is treated exactly as they are, margins
 *   included. Every other window of such a scope is withheld ('months'): calendar quarters (a
 *   year less three of its quarters, or two quarters less their months' neighbours, give months
 *   back) and whole-period windows (two consecutive ends differ by one month).
 * - In each yearly window the sites add up to the company: small site counts and their
 *   complements by marginSuppression, one deterministic order for every table. Where the company's
 *   months are shown its yearly count is known anyway, and a margin that would need the total
 *   withheld leaves that window's site counts unlabelled ('months') instead. A site's months
 *   shown beside the company's would not narrow the rest: any split of the sites' yearly counts
 *   fits any months.
 *
 * Stratum tables by age band and by sex are shown to those readers for the company only, in the
 * yearly windows (two overlapping tables would give a month's strata back by difference), each
 * withheld when it holds a small count; being disjoint, a withheld table stands alone. Every other
 * company table is listed as withheld ('strata').
 */
export function disclosureFrame(cells: Cell[], threshold: number, settings: WindowSettings = {}): WithheldCount[] {
  const offered = new Set(offeredWindows(settings));
  const ctx = windowContextOf(settings);
  // The other windows, withheld whole in a scope with a small month (the month and the rolling twelve months are handled below).
  const others = (['quarter', 'whole'] as const).filter((k) => offered.has(k));
  // The twelve-month windows ending in December: the rolling twelve months and the calendar year, one treatment.
  const twelve = (['rolling12', 'year'] as const).filter((k) => offered.has(k));
  // First month of the rolling twelve months ending at p (shared/src/windows.ts).
  const r12 = (p: number) => windowStartIndex('rolling12', p, ctx)!;
  const range = new Map<number, [number, number]>();
  for (const c of cells) {
    const m = monthIndex(c.month);
    const r = range.get(c.outcomeId);
    if (r) {
      r[0] = Math.min(r[0], m);
      r[1] = Math.max(r[1], m);
    } else range.set(c.outcomeId, [m, m]);
  }
  const series = new Map<string, MonthSeries>();
  const seriesOf = (key: string, outcomeId: number) => {
    let s = series.get(key);
    if (!s) series.set(key, (s = new MonthSeries(...range.get(outcomeId)!)));
    return s;
  };
  const sitesOf = new Map<string, Set<number>>();
  for (const c of cells) {
    const m = monthIndex(c.month);
    const g = `${c.outcomeId}|${c.groupId}`;
    seriesOf(`${g}|site|${c.siteId}`, c.outcomeId).add(m, c.cases, c.cents);
    seriesOf(`${g}|company`, c.outcomeId).add(m, c.cases, c.cents);
    for (const by of ['age', 'sex'] as const) seriesOf(`${g}|${by}|${STRATA[by](c)}`, c.outcomeId).add(m, c.cases, 0);
    (sitesOf.get(g) ?? sitesOf.set(g, new Set()).get(g)!).add(c.siteId);
  }

  const out: WithheldCount[] = [];
  for (const g of [...sitesOf.keys()].sort()) {
    const [outcomeId, exposureGroupId] = g.split('|').map(Number) as [number, number];
    const [first, last] = range.get(outcomeId)!;
    const push = (siteId: number | null, window: WithheldCount['window'], period: number | null, reason: FrameReason) =>
      out.push({ siteId, outcomeId, exposureGroupId, window, period: period === null ? null : monthIso(period), reason });
    // Calendar years: the rolling windows ending in December, disjoint, the same in every run.
    const ends = new Set<number>();
    for (let p = first; p <= last; p++) if (windowStartIndex('year', p, ctx) !== null) ends.add(p);
    const siteIds = [...sitesOf.get(g)!].sort((a, b) => a - b);
    const company = series.get(`${g}|company`)!;
    const sites = siteIds.map((s) => series.get(`${g}|site|${s}`)!);

    const strata = (by: 'age' | 'sex') => [...series.entries()].filter(([k]) => k.startsWith(`${g}|${by}|`)).map(([, s]) => s);
    for (const by of ['age', 'sex'] as const) {
      const tables = strata(by);
      for (let p = first; p <= last; p++) {
        if (!company.published(r12(p), p)) continue;
        if (!ends.has(p) || tables.some((t) => isSmallCount(t.cases(r12(p), p), threshold))) push(null, STRATA_WINDOW[by], p, 'strata');
      }
    }

    const companyOpen = !company.hasSmallMonth(threshold);
    const sitesOpen = sites.every((s) => !s.hasSmallMonth(threshold));
    if (companyOpen && sitesOpen) continue;
    const yearly = (siteId: number | null, s: MonthSeries) => {
      // Every month of the outcome: a scope's rows run over its cells' months of every group.
      for (let p = first; p <= last; p++) {
        if (s.published(p, p)) push(siteId, 'month', p, 'months');
        if (offered.has('rolling12') && !ends.has(p) && s.published(r12(p), p)) push(siteId, 'rolling12', p, 'months');
        for (const kind of others) {
          const start = windowStartIndex(kind, p, ctx);
          if (start !== null && s.published(start, p)) push(siteId, kind, p, 'months');
        }
      }
      if (s.published(first, last)) push(siteId, 'series', null, 'months');
    };
    if (!companyOpen) yearly(null, company);
    if (!sitesOpen) siteIds.forEach((s, i) => yearly(s, sites[i]!));
    const yearly12 = (siteId: number | null, p: number, reason: FrameReason) => twelve.forEach((kind) => push(siteId, kind, p, reason));
    for (const p of ends) {
      const parts = sites.map((s) => s.cases(r12(p), p));
      const total = company.cases(r12(p), p);
      const margin = marginSuppression(parts, threshold);
      if (isSmallCount(total, threshold)) {
        yearly12(null, p, 'small');
        margin.parts.forEach((w, i) => w && sites[i]!.published(r12(p), p) && yearly12(siteIds[i]!, p, w));
      } else if (margin.total && companyOpen) {
        siteIds.forEach((s, i) => sites[i]!.published(r12(p), p) && yearly12(s, p, 'months'));
      } else {
        margin.parts.forEach((w, i) => w && yearly12(siteIds[i]!, p, w));
        if (margin.total) yearly12(null, p, 'complement');
      }
    }
  }
  return out;
}

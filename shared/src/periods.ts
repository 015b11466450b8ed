import { z } from 'zod';
import { addMonths } from './months';
import { windowMonths, type WindowContext, type WindowKind } from './windows';

/**
 * Reporting periods: the state of one site × month, decided from what has been received.
 *
 * - `awaiting`: nothing received for the month (a site is expected when it had a roster in the
 *   12 months ending there).
 * - `hours_in`: the roster (hours worked) is in, no case list reports through the month yet.
 * - `cases_in`: a case list reports through the month, the roster is not in.
 * - `ready`: roster and case list are both in; the month counts as complete.
 * - `closed`: the hygienist closed the month. A closed month can still be corrected: the
 *   correction is applied and the period shows it (`correctedAfterClose`).
 *
 * A case list reports through a month for a set of sites (the upload's `reportsThrough`, by
 * default the latest rostered month of those sites when it was checked): every earlier month of
 * those sites counts as reported too, because a case list is cumulative.
 *
 * Complete: `ready` or `closed`. A site is expected in a month when it had a roster in the 12
 * months ending there and had not been retired before that month (a retired site keeps its
 * history: the months it was expected in still count). A company-wide month is complete when every expected site's month is; a window (any analysis window, shared/src/windows.ts) is complete when each of its months is. This file is the
 * one statement of these rules: the worker (watch rules), the API (results) and the web app
 * (calendar, labels) all use it.
 */
export const periodStates = ['awaiting', 'hours_in', 'cases_in', 'ready', 'closed'] as const;
export const periodStateSchema = z.enum(periodStates);
export type PeriodState = z.infer<typeof periodStateSchema>;

/** Words people read for each state (shown with a shape, never by colour alone). */
export const periodStateLabels: Record<PeriodState, string> = {
  awaiting: 'Nothing received',
  hours_in: 'Hours in, cases awaited',
  cases_in: 'Cases in, hours awaited',
  ready: 'Complete, open',
  closed: 'Closed',
};

/**
 * Whether the month's roster is in, from the state alone: a closed month may have none (the site
 * did not work it and the hygienist closed it anyway), so a closed month says so with `roster`.
 */
export function hasRoster(state: PeriodState, roster?: boolean | null): boolean {
  if (roster !== undefined && roster !== null) return roster;
  return state === 'hours_in' || state === 'ready' || state === 'closed';
}

export function isCompleteState(state: PeriodState): boolean {
  return state === 'ready' || state === 'closed';
}

/** The state from what is received; `closed` only when both are in or the hygienist closed it anyway. */
export function periodStateOf(p: { roster: boolean; cases: boolean; closed: boolean }): PeriodState {
  if (p.closed) return 'closed';
  if (p.roster && p.cases) return 'ready';
  if (p.roster) return 'hours_in';
  if (p.cases) return 'cases_in';
  return 'awaiting';
}

/** One site × month as the calendar and the runs see it. */
export const sitePeriodSchema = z.object({
  siteId: z.number().int(),
  /** First day of the month, YYYY-MM-DD. */
  month: z.string(),
  state: periodStateSchema,
  /** The month's roster is in (a closed month may have none). */
  roster: z.boolean(),
  /** Received after the month was closed (a correction). */
  correctedAfterClose: z.boolean(),
  closedAt: z.string().nullable(),
  closedBy: z.string().nullable(),
  /** The site was retired before this month (an administrator's decision): it is not expected to report it. */
  retired: z.boolean().optional(),
});
export type SitePeriod = z.infer<typeof sitePeriodSchema>;

/** Whether a window's result is built on complete months only. */
export const completenessSchema = z.enum(['complete', 'partial']);
export type Completeness = z.infer<typeof completenessSchema>;

/** Month arithmetic lives in months.ts; re-exported for the readers of periods. */
export { addMonths };

export { windowMonths };

/**
 * Period states of one run or of now, answering completeness questions for any scope. `states`
 * holds every site × month the data spans.
 */
export class PeriodBook {
  private readonly bySiteMonth = new Map<string, PeriodState>();
  private readonly rostered = new Set<string>();
  private readonly retired = new Set<string>();
  private readonly sites: number[];

  /**
   * `roster` may be left out (runs stored before it was recorded): then the state alone decides.
   * `retired` marks the months after a site's retirement (left out: not retired).
   */
  constructor(states: Array<Pick<SitePeriod, 'siteId' | 'month' | 'state'> & { roster?: boolean | null; retired?: boolean | null }>) {
    for (const s of states) {
      const key = `${s.siteId}|${s.month}`;
      this.bySiteMonth.set(key, s.state);
      if (hasRoster(s.state, s.roster)) this.rostered.add(key);
      if (s.retired) this.retired.add(key);
    }
    this.sites = [...new Set(states.map((s) => s.siteId))].sort((a, b) => a - b);
  }

  stateOf(siteId: number, month: string): PeriodState {
    return this.bySiteMonth.get(`${siteId}|${month}`) ?? 'awaiting';
  }

  /**
   * Sites expected to report `month`: those with a roster in the 12 months ending there (a case
   * list alone does not make a site active: a company-wide list names every site), unless retired
   * before that month.
   */
  expectedSites(month: string, among: readonly number[] = this.sites): number[] {
    return among.filter((s) => !this.retired.has(`${s}|${month}`) && windowMonths('rolling12', month).some((m) => this.rostered.has(`${s}|${m}`)));
  }

  /** Whether a site was retired before `month`. */
  isRetired(siteId: number, month: string): boolean {
    return this.retired.has(`${siteId}|${month}`);
  }

  /** A month of a scope (null: the company; else these sites) is complete when each expected site's month is. */
  monthComplete(month: string, siteIds: readonly number[] | null = null): boolean {
    const expected = this.expectedSites(month, siteIds ?? this.sites);
    return expected.length > 0 && expected.every((s) => isCompleteState(this.stateOf(s, month)));
  }

  /**
   * A window is complete when its last month is, and so is each earlier month in which some site
   * of the scope was expected (months before the scope's first data do not make it partial).
   */
  windowComplete(windowKind: WindowKind, period: string, siteIds: readonly number[] | null = null, ctx: WindowContext = { wholeStart: null }): boolean {
    if (!this.monthComplete(period, siteIds)) return false;
    const among = siteIds ?? this.sites;
    return windowMonths(windowKind, period, ctx).every((m) => this.expectedSites(m, among).length === 0 || this.monthComplete(m, siteIds));
  }

  completeness(windowKind: WindowKind, period: string, siteIds: readonly number[] | null = null, ctx: WindowContext = { wholeStart: null }): Completeness {
    return this.windowComplete(windowKind, period, siteIds, ctx) ? 'complete' : 'partial';
  }

  /** The latest complete month of a scope (null: the company), or null when none is. */
  latestComplete(siteIds: readonly number[] | null = null): string | null {
    const months = [...new Set([...this.bySiteMonth.keys()].map((k) => k.slice(k.indexOf('|') + 1)))].sort().reverse();
    return months.find((m) => this.monthComplete(m, siteIds)) ?? null;
  }
}

/** The latest complete month of the company (for readers of every site) and of each of the reader's sites. */
export const completeThroughSchema = z.object({
  company: z.string().nullable(),
  sites: z.array(z.object({ siteId: z.number().int(), month: z.string().nullable() })),
});
export type CompleteThrough = z.infer<typeof completeThroughSchema>;

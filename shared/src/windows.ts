import { z } from 'zod';
import { monthIndex, monthIso } from './months';

/**
 * Analysis windows: the spans of months a result sums, each named by its last month (its period).
 * This file is the one statement of them: the worker computes the windows of a run here, the API
 * checks completeness and stratum tables here, and the web app names them from here.
 *
 * - `month`: the month alone; a row at every month.
 * - `rolling12`: the twelve months ending at the period; a row at every month.
 * - `quarter`: a calendar quarter (January–March, April–June, July–September, October–December);
 *   a row at the quarter's last month only (March, June, September, December).
 * - `year`: a calendar year, January–December; a row in December only. It holds the same months as
 *   the rolling twelve months ending in December.
 * - `whole`: from the whole-period start (a setting) to the period, cumulative; a row at every month
 *   from the start on.
 *
 * The quarter and the year in progress have no row until their last month has data; the first
 * quarter or year of the data may hold fewer months (`monthsCovered` says how many had hours).
 */
export const windowKinds = ['month', 'rolling12', 'quarter', 'year', 'whole'] as const;
export const windowKindSchema = z.enum(windowKinds);
export type WindowKind = z.infer<typeof windowKindSchema>;

/** Names people read for each window (the whole period's start is added where it is known: windowLabel). */
export const windowLabels: Record<WindowKind, string> = {
  month: 'Single month',
  rolling12: 'Rolling 12 months',
  quarter: 'Calendar quarter',
  year: 'Calendar year',
  whole: 'Whole period',
};

/** The windows a settings version offers when it does not say: month and rolling 12 months (versions before windows were a setting). */
export const LEGACY_WINDOWS: readonly WindowKind[] = ['month', 'rolling12'];

/** The windows a new database offers: month, rolling 12 months and calendar year (common practice for annual surveillance summaries). */
export const DEFAULT_WINDOWS: readonly WindowKind[] = ['month', 'rolling12', 'year'];

/** A month as YYYY-MM-01. */
export const monthIsoSchema = z.string().regex(/^\d{4}-(0[1-9]|1[0-2])-01$/, 'a month as YYYY-MM-01');

// Months as consecutive integers (year × 12 + month − 1), so windows are plain ranges: shared/src/months.ts.
export { monthIndex, monthIso } from './months';

/** What a window needs besides its kind and last month: the whole-period start (null: none chosen, no whole-period rows). */
export interface WindowContext {
  wholeStart: string | null;
}

/**
 * First month (index) of the window of `kind` ending at month index `end`, or null when `end` is
 * not the last month of such a window (a quarter ends in March, June, September, December; a
 * year in December; a whole period at any month from its start on).
 */
export function windowStartIndex(kind: WindowKind, end: number, ctx: WindowContext): number | null {
  switch (kind) {
    case 'month':
      return end;
    case 'rolling12':
      return end - 11;
    case 'quarter':
      return end % 3 === 2 ? end - 2 : null;
    case 'year':
      return end % 12 === 11 ? end - 11 : null;
    case 'whole': {
      if (ctx.wholeStart === null) return null;
      const start = monthIndex(ctx.wholeStart);
      return end >= start ? start : null;
    }
  }
}

/** Whether `period` (YYYY-MM-01) is the last month of a window of `kind`. */
export function isWindowEnd(kind: WindowKind, period: string, ctx: WindowContext): boolean {
  return windowStartIndex(kind, monthIndex(period), ctx) !== null;
}

/** Months a window covers, ending at `period`, oldest first; empty when `period` ends no window of that kind. */
export function windowMonths(kind: WindowKind, period: string, ctx: WindowContext = { wholeStart: null }): string[] {
  const end = monthIndex(period);
  const start = windowStartIndex(kind, end, ctx);
  if (start === null) return [];
  return Array.from({ length: end - start + 1 }, (_, i) => monthIso(start + i));
}

/**
 * Whether a window's stratum tables (by age band, by sex) may be shown to readers other than the
 * physician: only the yearly windows, the rolling twelve months ending in December and the
 * calendar year (the same months), decided per run by the disclosure frame.
 */
export function isTwelveMonthWindow(kind: WindowKind): kind is 'rolling12' | 'year' {
  return kind === 'rolling12' || kind === 'year';
}

/** The windows as a settings version states them. */
export interface WindowSettings {
  windows?: readonly WindowKind[] | undefined;
  wholePeriodStart?: string | null | undefined;
}

/**
 * The windows a settings version offers, in the canonical order: the month always; absent, those
 * of the versions before windows were a setting (month and rolling 12 months); the whole period
 * only with a start.
 */
export function offeredWindows(s: WindowSettings): WindowKind[] {
  const chosen = new Set<WindowKind>(s.windows ?? LEGACY_WINDOWS);
  chosen.add('month');
  if (!s.wholePeriodStart) chosen.delete('whole');
  return windowKinds.filter((k) => chosen.has(k));
}

/** The window context of a settings version. */
export function windowContextOf(s: WindowSettings): WindowContext {
  return { wholeStart: s.windows?.includes('whole') && s.wholePeriodStart ? s.wholePeriodStart : null };
}

/** "Month 2025-03" style names: the whole period says its start ("Whole period from March 2024"). */
export function windowLabel(kind: WindowKind, ctx: WindowContext, formatMonth: (iso: string) => string = (m) => m.slice(0, 7)): string {
  return kind === 'whole' && ctx.wholeStart ? `${windowLabels.whole} from ${formatMonth(ctx.wholeStart)}` : windowLabels[kind];
}

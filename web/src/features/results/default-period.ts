import type { WindowKind } from '@ratewarden/shared/rules';
import type { RunResult } from '@ratewarden/shared/runs';
import { periodsOf } from './results-filters';

/**
 * The period a results page opens on: the latest one that was complete when the run read its data
 * (a month, or a rolling window, whose rosters and case lists were all in), and that the reader
 * can see. A group with small monthly counts is shown to non-physicians in the windows that end
 * in December only (README "Small counts"), so the latest complete period with every group shown
 * comes first, then the latest complete one showing some group, then the latest complete one,
 * and only when no period is complete the newest.
 */
export function defaultPeriod(results: RunResult[], window: WindowKind): string | null {
  const periods = periodsOf(results, window);
  const rowsOf = (p: string) => results.filter((r) => r.window === window && r.period === p);
  const complete = (p: string) => rowsOf(p).every((r) => r.completeness === 'complete');
  const everyGroupShown = (p: string) => rowsOf(p).every((r) => r.withheld !== 'months');
  const someGroupShown = (p: string) => rowsOf(p).some((r) => r.withheld === null);
  return (
    periods.find((p) => complete(p) && everyGroupShown(p)) ??
    periods.find((p) => complete(p) && someGroupShown(p)) ??
    periods.find(complete) ??
    periods[0] ??
    null
  );
}

/** Whether any figure of the period was computed while one of its months was still partial. */
export function isPartialPeriod(results: RunResult[], window: WindowKind, period: string | null): boolean {
  return period !== null && results.some((r) => r.window === window && r.period === period && r.completeness === 'partial');
}

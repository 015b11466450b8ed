import type { RunPeriodIndex } from '@ratewarden/shared/runs';

type IndexedPeriod = RunPeriodIndex['periods'][number];

/**
 * The period a results page opens on, from the run's period index (newest first): the latest one
 * that was complete when the run read its data (a month, or a rolling window, whose rosters and
 * case lists were all in), and that the reader can see. A group with small monthly counts is
 * shown to non-physicians in the windows that end in December only (README "Small counts"), so
 * the latest complete period with every group shown comes first, then the latest complete one
 * showing some group, then the latest complete one, and only when no period is complete the newest.
 */
export function defaultPeriod(periods: IndexedPeriod[]): string | null {
  const complete = (p: IndexedPeriod) => p.completeness === 'complete';
  return (
    periods.find((p) => complete(p) && p.everyGroupShown)?.period ??
    periods.find((p) => complete(p) && p.someGroupShown)?.period ??
    periods.find(complete)?.period ??
    periods[0]?.period ??
    null
  );
}

/** Whether the period's figures were computed while one of its months was still partial. */
export function isPartialPeriod(periods: IndexedPeriod[], period: string | null): boolean {
  return period !== null && periods.some((p) => p.period === period && p.completeness === 'partial');
}

/** The latest complete period, for the note beside a partial one. */
export function latestCompletePeriod(periods: IndexedPeriod[]): string | null {
  return periods.find((p) => p.completeness === 'complete')?.period ?? null;
}

import type { WindowKind, WindowSettings } from '@ratewarden/shared/windows';
import { formatMonth } from '../../lib/dates';
import { windowPeriodText } from './window-text';

/** The hollow marker of a partial period, beside its words (never colour alone). */
export const PARTIAL_SHAPE = '◌';

/** " (partial)" after a period's name where it is partial. */
export const partialSuffix = (partial: boolean) => (partial ? ' (partial)' : '');

/**
 * Says that the period shown was partial when the run read its data: a site's roster or case
 * list of one of its months was not in, so its figures may still change (person-time without its
 * cases makes rates too low).
 */
export function PartialPeriodNote({
  period,
  window,
  settings,
  latestComplete,
}: {
  period: string;
  window: WindowKind;
  settings: WindowSettings;
  latestComplete: string | null;
}) {
  const text = windowPeriodText(window, period, settings);
  const what = text.charAt(0).toUpperCase() + text.slice(1);
  return (
    <p role="note" className="mt-4 max-w-3xl note note-watch note-dashed px-4 py-2 text-sm">
      <span aria-hidden="true" className="mr-1 font-bold">
        {PARTIAL_SHAPE}
      </span>
      <strong>Partial period.</strong> {what} was not complete when this run read the data: a roster or a case list of some site was not in yet, so these
      figures may still change. {latestComplete ? `The latest complete period is ${formatMonth(latestComplete)}.` : 'No period was complete yet.'}
    </p>
  );
}

import type { Role } from '@ratewarden/shared/domain';
import { roleMay } from '@ratewarden/shared/permissions';
import { DEFAULT_SMALL_CELL_THRESHOLD, type SplitWithheld, type Withheld } from '@ratewarden/shared/small-cells';

/**
 * Small-cell suppression: a count below the threshold (the server's SMALL_CELL_THRESHOLD, default 5) could
 * point at an identifiable person, so every role but the physician sees "<5" instead of it, in
 * charts, tables and exports alike (common practice in occupational and public-health reporting).
 * The API suppresses too; this keeps the screen consistent with what it sends.
 */
export interface ShownCount {
  /** What to print: the count or "<threshold". */
  text: string;
  /** The count for exports and sorting; null when suppressed. */
  value: number | null;
  suppressed: boolean;
}

export function maySeeSmallCells(role: Role | null | undefined): boolean {
  return roleMay(role, 'counts:small');
}

let threshold = DEFAULT_SMALL_CELL_THRESHOLD;

/** Takes the server's threshold from the session (api/get-session.ts), so the screen says what the server withholds. */
export function setSmallCellThreshold(value: number): void {
  threshold = value;
}

/** The threshold in force: counts from 1 to this − 1 are withheld for every role but the physician. */
export function smallCellThreshold(): number {
  return threshold;
}

/** What a count withheld for another reason than being small shows (a complement, a month read by year, a stratum, an earlier run's). */
export const COMPLEMENT_TEXT = 'withheld';

/**
 * Counts from 1 to threshold − 1 are withheld; a zero points at nobody and is shown (the API's rule
 * too). `withheld` is the API's own marker for a count it did not send: true or 'small' for a small
 * count, 'complement' for one withheld so that a small count elsewhere cannot be got back by
 * subtraction (shared/src/small-cells.ts).
 */
export function showCount(
  count: number | null,
  role: Role | null | undefined,
  t: number = threshold,
  withheld: boolean | Withheld | SplitWithheld | null = false,
): ShownCount {
  // Only a count withheld for being small says so; every other reason reads "withheld".
  if (withheld && withheld !== true && withheld !== 'small') return { text: COMPLEMENT_TEXT, value: null, suppressed: true };
  if (withheld) return { text: `<${t}`, value: null, suppressed: true };
  if (count === null) return { text: 'not available', value: null, suppressed: false };
  if (!maySeeSmallCells(role) && count > 0 && count < t) return { text: `<${t}`, value: null, suppressed: true };
  return { text: new Intl.NumberFormat('en-GB').format(count), value: count, suppressed: false };
}

/** For CSV: the count itself, or the "<5" text when suppressed, never the hidden number. */
export function exportCount(
  count: number | null,
  role: Role | null | undefined,
  t: number = threshold,
  withheld: boolean | Withheld | SplitWithheld | null = false,
): string | number | null {
  const shown = showCount(count, role, t, withheld);
  return shown.suppressed ? shown.text : shown.value;
}

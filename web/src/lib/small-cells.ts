import type { Role } from '@ratewarden/shared/domain';
import { env } from '../config/env';

/**
 * Small-cell suppression: a count below the threshold (default 5, VITE_SMALL_CELL_THRESHOLD) could
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
  return role === 'physician';
}

export function showCount(count: number | null, role: Role | null | undefined, threshold: number = env.VITE_SMALL_CELL_THRESHOLD): ShownCount {
  if (count === null) return { text: 'not available', value: null, suppressed: false };
  if (!maySeeSmallCells(role) && count < threshold) return { text: `<${threshold}`, value: null, suppressed: true };
  return { text: new Intl.NumberFormat('en-GB').format(count), value: count, suppressed: false };
}

/** For CSV: the count itself, or the "<5" text when suppressed, never the hidden number. */
export function exportCount(count: number | null, role: Role | null | undefined, threshold: number = env.VITE_SMALL_CELL_THRESHOLD): string | number | null {
  const shown = showCount(count, role, threshold);
  return shown.suppressed ? shown.text : shown.value;
}

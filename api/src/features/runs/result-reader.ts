import type { Principal } from '@ratewarden/shared/permissions';
import type { Withheld } from '@ratewarden/shared/small-cells';
import { toJsonValue } from '@ratewarden/shared/stats';
import { withheldCount, type RunFrame } from '../../disclosure/run-frame';

/** Who reads results and how: their scope and whether small counts are shown. */
export interface ResultReader {
  principal: Principal;
  smallCellThreshold: number;
}

/** A stored double as JSON: infinities as strings, NaN as null. */
export const n = (v: unknown) => toJsonValue(v) as number | 'Infinity' | '-Infinity' | null;

/** withheldCount for a row's count, which may be missing (no row: nothing to withhold). */
export function withheldOf(
  frame: RunFrame | null,
  cases: number | null,
  siteId: number | null,
  outcomeId: number,
  groupId: number,
  window: string,
  period: string,
  threshold: number,
): Withheld | null {
  return cases === null ? null : withheldCount(frame, cases, threshold, siteId, outcomeId, groupId, window, period);
}

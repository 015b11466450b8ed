import { monthOf, type CellBounds } from '@ratewarden/shared/intake-cell';

/** The month bound of the cell rules: the current month, unless months still to come are allowed. */
export function intakeBounds(allowFutureMonths = false, now = new Date()): CellBounds {
  return { latestMonth: allowFutureMonths ? null : monthOf(now) };
}

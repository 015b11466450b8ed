/**
 * Number formatting for figures on screen: the one rule in shared/src/number-format.ts, under the
 * names the pages use. Estimates, limits, person-time and axis ticks all go through `formatFigure`.
 */
import { formatCount, formatFigure, formatInterval, formatP, formatPercent, NOT_DEFINED } from '@ratewarden/shared/number-format';

export { formatCount, formatInterval, formatP, formatPercent, NOT_DEFINED };

export const formatEstimate = formatFigure;

/** Person-time and other amounts read back: the same rule. */
export const formatAmount = formatFigure;

import { monthIndex, monthIso, windowContextOf, windowLabel, windowStartIndex, type WindowKind, type WindowSettings } from '@ratewarden/shared/windows';
import { formatMonth } from '../../lib/dates';

/** The windows of shared/src/windows.ts as the results pages word them. */

/** A window's name in the window choice ("Whole period from Mar 2024"). */
export function windowName(kind: WindowKind, settings: WindowSettings): string {
  return windowLabel(kind, windowContextOf(settings), formatMonth);
}

/** First month of the window ending at `period` (the period itself when it ends none). */
function startOf(kind: WindowKind, period: string, settings: WindowSettings): string {
  const start = windowStartIndex(kind, monthIndex(period), windowContextOf(settings));
  return start === null ? period : monthIso(start);
}

/** One period in the period choice: "Mar 2025", "Q1 2025", "2025", "Mar 2024 to Mar 2025". */
export function periodName(kind: WindowKind, period: string, settings: WindowSettings): string {
  const year = period.slice(0, 4);
  switch (kind) {
    case 'quarter':
      return `Q${Math.floor((Number(period.slice(5, 7)) - 1) / 3) + 1} ${year}`;
    case 'year':
      return year;
    case 'whole':
      return `${formatMonth(startOf(kind, period, settings))} to ${formatMonth(period)}`;
    default:
      return formatMonth(period);
  }
}

/** The label of the period choice for a window. */
export const periodChoiceLabel: Record<WindowKind, string> = {
  month: 'Month',
  rolling12: 'Twelve months ending',
  quarter: 'Calendar quarter',
  year: 'Calendar year',
  whole: 'Whole period to',
};

/** The span a figure covers, in a sentence: "month of Mar 2025", "calendar quarter Q1 2025 (Jan 2025 to Mar 2025)". */
export function windowPeriodText(kind: WindowKind, period: string, settings: WindowSettings): string {
  switch (kind) {
    case 'month':
      return `month of ${formatMonth(period)}`;
    case 'rolling12':
      return `twelve months ending ${formatMonth(period)}`;
    case 'quarter':
      return `calendar quarter ${periodName(kind, period, settings)} (${formatMonth(startOf(kind, period, settings))} to ${formatMonth(period)})`;
    case 'year':
      return `calendar year ${periodName(kind, period, settings)}`;
    case 'whole':
      return `whole period ${periodName(kind, period, settings)}`;
  }
}

/** How a trend chart's title says the window: "rate per month", "rate per calendar quarter". */
export const trendPhrase: Record<WindowKind, string> = {
  month: 'per month',
  rolling12: 'over rolling 12 months',
  quarter: 'per calendar quarter',
  year: 'per calendar year',
  whole: 'over the whole period, cumulative',
};

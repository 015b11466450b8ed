import type { PeriodState } from '@ratewarden/shared/periods';

/**
 * The shape beside each state's words on the calendar, filled as more arrives: the state is
 * read from the shape and the words, never from colour alone.
 */
export const periodStateShapes: Record<PeriodState, string> = {
  awaiting: '○',
  hours_in: '◐',
  cases_in: '◑',
  ready: '●',
  closed: '■',
};

/** The left rule of a cell: a repeat of the words for those who see colour. */
export const periodStateRules: Record<PeriodState, string> = {
  awaiting: 'border-rule',
  hours_in: 'border-amber',
  cases_in: 'border-amber',
  ready: 'border-moss',
  closed: 'border-ink',
};

export const CORRECTED_SHAPE = '✎';
export const CORRECTED_TEXT = 'corrected after closing';

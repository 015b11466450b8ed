import type { PeriodState } from '@ratewarden/shared/periods';
import type { Shape, Tone } from '../../components/status/status-shape';

/**
 * The shape beside each state's words on the calendar, from the status family: the circle fills
 * as more arrives, a closed month is a square. The state is read from the shape and the words,
 * never from colour alone.
 */
export const periodStateShapes: Record<PeriodState, Shape> = {
  awaiting: 'ring',
  hours_in: 'half-left',
  cases_in: 'half-right',
  ready: 'disc',
  closed: 'square',
};

export const periodStateTones: Record<PeriodState, Tone> = {
  awaiting: 'neutral',
  hours_in: 'attention',
  cases_in: 'attention',
  ready: 'good',
  closed: 'done',
};

export const CORRECTED_SHAPE = '✎';
export const CORRECTED_TEXT = 'corrected after closing';

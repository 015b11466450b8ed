import type { CloseReason, FlagEventKind, FlagState } from '@ratewarden/shared/flags';
import type { RuleMeasure, ThresholdOn } from '@ratewarden/shared/rules';
import type { Tone } from '../../components/status/state-tag';

/** Ratewarden's words for flag states, reasons and events (DESIGN.md vocabulary). */
export const flagStateLabels: Record<FlagState, { text: string; tone: Tone }> = {
  raised: { text: 'raised', tone: 'alarm' },
  in_review: { text: 'in review', tone: 'attention' },
  closed: { text: 'closed', tone: 'muted' },
};

export const closeReasonLabels: Record<CloseReason, string> = {
  explained: 'Explained',
  action_taken: 'Action taken',
  not_substantiated: 'Not substantiated',
};

export const closeReasonHints: Record<CloseReason, string> = {
  explained: 'the figures have a known cause that needs no action (a change of case finding, a reorganisation)',
  action_taken: 'a control, an investigation or a referral has been started',
  not_substantiated: 'on review the excess does not hold up (chance, a data error, too few cases)',
};

export const eventLabels: Record<FlagEventKind, string> = {
  raised: 'Raised by a run',
  updated: 'Figures updated by a run',
  escalated: 'Escalated by a run',
  eased: 'Worsening withdrawn by a run',
  cleared: 'No longer past the rule',
  crossed_again: 'Past the rule again',
  review_started: 'Review started',
  closed: 'Closed',
};

export const measureLabels: Record<RuleMeasure, string> = {
  irr: 'incidence rate ratio against the reference group',
  ird: 'rate difference against the reference group',
  rate: "the group's own rate",
  uchart: 'a month above the u-chart upper limit',
  sir: 'standardized incidence ratio (SIR) against the reference rates',
};

export const thresholdOnLabels: Record<ThresholdOn, string> = {
  estimate: 'the estimate',
  lower_bound: 'the lower bound of its interval',
};

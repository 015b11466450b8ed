import type { CaseAttribution, CaseDecision } from '@ratewarden/shared/cases';
import type { CaseStatus } from '@ratewarden/shared/intake';

export const caseStatusLabels: Record<CaseStatus, string> = { suspected: 'Suspected', confirmed: 'Confirmed', ruled_out: 'Ruled out' };

export const caseDecisionLabels: Record<CaseDecision, string> = {
  confirm: 'Confirm the case',
  rule_out: 'Rule the case out',
  reopen: 'Reopen (back to suspected)',
};

export const attributionLabels: Record<CaseAttribution['state'], string> = {
  attributed: 'Counted in a group',
  unattributed: 'Counted, no roster row',
  not_counted: 'Not counted',
  no_run: 'No run yet',
};

/** The decisions that change a case of this status. */
export const decisionsFor = (status: CaseStatus): CaseDecision[] =>
  status === 'suspected' ? ['confirm', 'rule_out'] : status === 'confirmed' ? ['rule_out', 'reopen'] : ['confirm', 'reopen'];

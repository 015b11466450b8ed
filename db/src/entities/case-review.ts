import { EntitySchema } from 'typeorm';
import type { CaseStatus } from '@ratewarden/shared/intake';

/** A physician's decision on one case, with its reason: the case's next version names it. Case-level. */
export interface CaseReview {
  id: string;
  caseRef: string;
  decision: 'confirm' | 'rule_out' | 'reopen';
  fromStatus: CaseStatus;
  toStatus: CaseStatus;
  reason: string;
  decidedBy: string;
  decidedAt: Date;
}

export const CaseReviewEntity = new EntitySchema<CaseReview>({
  name: 'CaseReview',
  tableName: 'case_reviews',
  columns: {
    id: { type: 'bigint', primary: true, generated: 'increment' },
    caseRef: { name: 'case_ref', type: 'text' },
    decision: { type: 'text' },
    fromStatus: { name: 'from_status', type: 'text' },
    toStatus: { name: 'to_status', type: 'text' },
    reason: { type: 'text' },
    decidedBy: { name: 'decided_by', type: 'uuid' },
    decidedAt: { name: 'decided_at', type: 'timestamptz', createDate: true },
  },
});

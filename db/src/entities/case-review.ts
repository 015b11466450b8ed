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
  // Constraints and indexes as the migrations build them (tests/integration/entities-schema.test.ts).
  checks: [
    { name: 'case_reviews_decision_check', expression: "(decision = ANY (ARRAY['confirm'::text, 'rule_out'::text, 'reopen'::text]))" },
    { name: 'case_reviews_from_status_check', expression: "(from_status = ANY (ARRAY['suspected'::text, 'confirmed'::text, 'ruled_out'::text]))" },
    { name: 'case_reviews_reason_check', expression: '(length(btrim(reason)) > 0)' },
    { name: 'case_reviews_to_status_check', expression: "(to_status = ANY (ARRAY['suspected'::text, 'confirmed'::text, 'ruled_out'::text]))" },
  ],
  indices: [{ name: 'case_reviews_case', columns: ['caseRef', 'decidedAt'] }],
  foreignKeys: [{ name: 'case_reviews_decided_by_fkey', target: 'User', columnNames: ['decided_by'], referencedColumnNames: ['id'] }],
});

import { EntitySchema } from 'typeorm';
import type { CaseStatus } from '@ratewarden/shared/intake';

/** A case of a case list whose status contradicts a physician's decision, and how a physician resolved it. Case-level. */
export interface IntakeCaseConflict {
  intakeId: string;
  caseRef: string;
  reviewId: string;
  decidedStatus: CaseStatus;
  listStatus: CaseStatus;
  resolution: 'keep' | 'accept' | null;
  resolvedBy: string | null;
  resolvedAt: Date | null;
}

export const IntakeCaseConflictEntity = new EntitySchema<IntakeCaseConflict>({
  name: 'IntakeCaseConflict',
  tableName: 'intake_case_conflicts',
  columns: {
    intakeId: { name: 'intake_id', type: 'uuid', primary: true },
    caseRef: { name: 'case_ref', type: 'text', primary: true },
    reviewId: { name: 'review_id', type: 'bigint' },
    decidedStatus: { name: 'decided_status', type: 'text' },
    listStatus: { name: 'list_status', type: 'text' },
    resolution: { type: 'text', nullable: true },
    resolvedBy: { name: 'resolved_by', type: 'uuid', nullable: true },
    resolvedAt: { name: 'resolved_at', type: 'timestamptz', nullable: true },
  },
});

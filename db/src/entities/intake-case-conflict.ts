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
  // Constraints and indexes as the migrations build them (tests/integration/entities-schema.test.ts).
  checks: [
    { name: 'intake_case_conflicts_check', expression: '((resolution IS NULL) = (resolved_at IS NULL))' },
    {
      name: 'intake_case_conflicts_decided_status_check',
      expression: "(decided_status = ANY (ARRAY['suspected'::text, 'confirmed'::text, 'ruled_out'::text]))",
    },
    { name: 'intake_case_conflicts_list_status_check', expression: "(list_status = ANY (ARRAY['suspected'::text, 'confirmed'::text, 'ruled_out'::text]))" },
    { name: 'intake_case_conflicts_resolution_check', expression: "(resolution = ANY (ARRAY['keep'::text, 'accept'::text]))" },
  ],
  foreignKeys: [
    { name: 'intake_case_conflicts_intake_id_fkey', target: 'Intake', columnNames: ['intake_id'], referencedColumnNames: ['id'], onDelete: 'CASCADE' },
    { name: 'intake_case_conflicts_resolved_by_fkey', target: 'User', columnNames: ['resolved_by'], referencedColumnNames: ['id'] },
    { name: 'intake_case_conflicts_review_id_fkey', target: 'CaseReview', columnNames: ['review_id'], referencedColumnNames: ['id'] },
  ],
});

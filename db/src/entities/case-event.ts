import { EntitySchema } from 'typeorm';
import type { CaseStatus } from '@ratewarden/shared/intake';

/** One health-outcome case of one worker, as brought by one intake. Case-level: physician only. */
export interface CaseEvent {
  id: string;
  intakeId: string;
  /** The case's identifier in the source system, stable across corrections. */
  caseRef: string;
  workerId: string;
  outcomeId: number;
  onsetDate: string;
  status: CaseStatus;
  /** The intake whose later version replaced this one; its own intake when a review replaced it. */
  supersededBy: string | null;
  /** The physician's review that made this version, for a decision's version. */
  reviewId: string | null;
  /** The physician's review that replaced this version. */
  supersededByReview: string | null;
  createdAt: Date;
}

export const CaseEventEntity = new EntitySchema<CaseEvent>({
  name: 'CaseEvent',
  tableName: 'case_events',
  columns: {
    id: { type: 'bigint', primary: true, generated: 'increment' },
    intakeId: { name: 'intake_id', type: 'uuid' },
    caseRef: { name: 'case_ref', type: 'text' },
    workerId: { name: 'worker_id', type: 'bigint' },
    outcomeId: { name: 'outcome_id', type: 'integer' },
    onsetDate: { name: 'onset_date', type: 'date' },
    status: { type: 'text' },
    supersededBy: { name: 'superseded_by', type: 'uuid', nullable: true },
    reviewId: { name: 'review_id', type: 'bigint', nullable: true },
    supersededByReview: { name: 'superseded_by_review', type: 'bigint', nullable: true },
    createdAt: { name: 'created_at', type: 'timestamptz', createDate: true },
  },
  // Constraints and indexes as the migrations build them (tests/integration/entities-schema.test.ts).
  checks: [
    { name: 'case_events_review_superseded', expression: '((superseded_by_review IS NULL) OR (superseded_by IS NOT NULL))' },
    { name: 'case_events_status_check', expression: "(status = ANY (ARRAY['suspected'::text, 'confirmed'::text, 'ruled_out'::text]))" },
  ],
  indices: [
    { name: 'case_events_current', columns: ['caseRef'], unique: true, where: '(superseded_by IS NULL)' },
    { name: 'case_events_intake', columns: ['intakeId'] },
    { name: 'case_events_outcome', columns: ['outcomeId', 'onsetDate'], where: '(superseded_by IS NULL)' },
    { name: 'case_events_ref', columns: ['caseRef'] },
    { name: 'case_events_worker', columns: ['workerId'], where: '(superseded_by IS NULL)' },
  ],
  foreignKeys: [
    { name: 'case_events_intake_id_fkey', target: 'Intake', columnNames: ['intake_id'], referencedColumnNames: ['id'], onDelete: 'CASCADE' },
    { name: 'case_events_outcome_id_fkey', target: 'Outcome', columnNames: ['outcome_id'], referencedColumnNames: ['id'] },
    { name: 'case_events_review_id_fkey', target: 'CaseReview', columnNames: ['review_id'], referencedColumnNames: ['id'] },
    { name: 'case_events_superseded_by_fkey', target: 'Intake', columnNames: ['superseded_by'], referencedColumnNames: ['id'] },
    { name: 'case_events_superseded_by_review_fkey', target: 'CaseReview', columnNames: ['superseded_by_review'], referencedColumnNames: ['id'] },
    { name: 'case_events_worker_id_fkey', target: 'Worker', columnNames: ['worker_id'], referencedColumnNames: ['id'] },
  ],
});

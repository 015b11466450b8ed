import { EntitySchema } from 'typeorm';

/**
 * A request for a run: written when an intake is applied or restored, by the run button, and when
 * a month is closed or reopened. The worker runs after the latest pending request has been quiet
 * for RUN_QUIET_SECONDS, or at once when one of them is `immediate` (the run button).
 */
export interface RunRequest {
  id: string;
  requestedAt: Date;
  reason: string;
  intakeId: string | null;
  pickedAt: Date | null;
  immediate: boolean;
}

export const RunRequestEntity = new EntitySchema<RunRequest>({
  name: 'RunRequest',
  tableName: 'run_requests',
  columns: {
    id: { type: 'bigint', primary: true, generated: 'increment' },
    requestedAt: { name: 'requested_at', type: 'timestamptz', default: () => 'now()' },
    reason: { type: 'text' },
    intakeId: { name: 'intake_id', type: 'uuid', nullable: true },
    pickedAt: { name: 'picked_at', type: 'timestamptz', nullable: true },
    immediate: { type: 'boolean', default: false },
  },
  // Constraints and indexes as the migrations build them (tests/integration/entities-schema.test.ts).
  indices: [{ name: 'run_requests_pending', columns: ['requestedAt'], where: '(picked_at IS NULL)' }],
  foreignKeys: [{ name: 'run_requests_intake_id_fkey', target: 'Intake', columnNames: ['intake_id'], referencedColumnNames: ['id'] }],
});

import { EntitySchema } from 'typeorm';

/** The one-row pointer to the run whose results are live. */
export interface CurrentRun {
  singleton: boolean;
  runId: string;
  switchedAt: Date;
}

export const CurrentRunEntity = new EntitySchema<CurrentRun>({
  name: 'CurrentRun',
  tableName: 'current_run',
  columns: {
    singleton: { type: 'boolean', primary: true, default: true },
    runId: { name: 'run_id', type: 'uuid' },
    switchedAt: { name: 'switched_at', type: 'timestamptz', default: () => 'now()' },
  },
  // Constraints and indexes as the migrations build them (tests/integration/entities-schema.test.ts).
  checks: [{ name: 'current_run_singleton_check', expression: 'singleton' }],
  foreignKeys: [{ name: 'current_run_run_id_fkey', target: 'Run', columnNames: ['run_id'], referencedColumnNames: ['id'] }],
});

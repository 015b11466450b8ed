import { EntitySchema } from 'typeorm';

/** A counted case a run attributed to no roster row, with the reason (see the RunUnattributed migration). */
export interface RunUnattributed {
  runId: string;
  caseEventId: string;
  outcomeId: number;
  reason: 'no_roster_month' | 'removed_by_correction' | 'lag_outside_data';
}

export const RunUnattributedEntity = new EntitySchema<RunUnattributed>({
  name: 'RunUnattributed',
  tableName: 'run_unattributed',
  columns: {
    runId: { name: 'run_id', type: 'uuid', primary: true },
    caseEventId: { name: 'case_event_id', type: 'bigint', primary: true },
    outcomeId: { name: 'outcome_id', type: 'integer' },
    reason: { type: 'text' },
  },
  // Constraints and indexes as the migrations build them (tests/integration/entities-schema.test.ts).
  checks: [
    {
      name: 'run_unattributed_reason_check',
      expression: "(reason = ANY (ARRAY['no_roster_month'::text, 'removed_by_correction'::text, 'lag_outside_data'::text]))",
    },
  ],
  indices: [{ name: 'run_unattributed_case', columns: ['caseEventId'] }],
  foreignKeys: [
    { name: 'run_unattributed_case_event_id_fkey', target: 'CaseEvent', columnNames: ['case_event_id'], referencedColumnNames: ['id'], onDelete: 'CASCADE' },
    { name: 'run_unattributed_run_id_fkey', target: 'Run', columnNames: ['run_id'], referencedColumnNames: ['id'], onDelete: 'CASCADE' },
  ],
});

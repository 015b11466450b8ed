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
});

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
});

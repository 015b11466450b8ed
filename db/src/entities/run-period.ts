import { EntitySchema } from 'typeorm';
import type { PeriodState } from '@ratewarden/shared/periods';

/** The state of one site × month as a run saw it. */
export interface RunPeriod {
  runId: string;
  siteId: number;
  month: string;
  state: PeriodState;
  /** The month's roster was in (null for runs stored before it was recorded). */
  roster: boolean | null;
  /** The site had been retired before this month (not expected to report it). */
  retired: boolean;
}

export const RunPeriodEntity = new EntitySchema<RunPeriod>({
  name: 'RunPeriod',
  tableName: 'run_periods',
  columns: {
    runId: { name: 'run_id', type: 'uuid', primary: true },
    siteId: { name: 'site_id', type: 'integer', primary: true },
    month: { type: 'date', primary: true },
    state: { type: 'text' },
    roster: { type: 'boolean', nullable: true },
    retired: { type: 'boolean', default: false },
  },
  // Constraints and indexes as the migrations build them (tests/integration/entities-schema.test.ts).
  checks: [
    {
      name: 'run_periods_state_check',
      expression: "(state = ANY (ARRAY['awaiting'::text, 'hours_in'::text, 'cases_in'::text, 'ready'::text, 'closed'::text]))",
    },
  ],
  foreignKeys: [{ name: 'run_periods_run_id_fkey', target: 'Run', columnNames: ['run_id'], referencedColumnNames: ['id'], onDelete: 'CASCADE' }],
});

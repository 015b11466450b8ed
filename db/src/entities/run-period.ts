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
});

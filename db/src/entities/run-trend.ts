import { EntitySchema } from 'typeorm';
import type { WindowKind } from '@ratewarden/shared/rules';

/** The score test for trend across ordered exposure levels, per outcome × window × period of a run. */
export interface RunTrend {
  runId: string;
  /** null: the whole company; else that site alone. */
  siteId: number | null;
  outcomeId: number;
  windowKind: WindowKind;
  period: string;
  chi2: number | null;
  p: number | null;
  /** Signed score statistic: positive when rates rise with the exposure level. */
  u: number | null;
  levels: Array<{ level: number; cases: number; personTime: number; rate: number | null }>;
}

export const RunTrendEntity = new EntitySchema<RunTrend>({
  name: 'RunTrend',
  tableName: 'run_trends',
  columns: {
    runId: { name: 'run_id', type: 'uuid', primary: true },
    siteId: { name: 'site_id', type: 'integer', nullable: true },
    outcomeId: { name: 'outcome_id', type: 'integer', primary: true },
    windowKind: { name: 'window_kind', type: 'text', primary: true },
    period: { type: 'date', primary: true },
    chi2: { type: 'double precision', nullable: true },
    p: { type: 'double precision', nullable: true },
    u: { type: 'double precision', nullable: true },
    levels: { type: 'jsonb' },
  },
});

import type { EntityManager } from 'typeorm';
import type { SitePeriod } from '@ratewarden/shared/periods';

/** Stores the reporting state of every site × month the run saw (run_periods), in one statement. */
export async function storeRunPeriods(em: EntityManager, runId: string, periods: SitePeriod[]): Promise<void> {
  await em.query(
    `INSERT INTO run_periods (run_id, site_id, month, state, roster, retired) SELECT $1, * FROM unnest($2::int[], $3::date[], $4::text[], $5::boolean[], $6::boolean[])`,
    [
      runId,
      periods.map((p) => p.siteId),
      periods.map((p) => p.month),
      periods.map((p) => p.state),
      periods.map((p) => p.roster),
      periods.map((p) => p.retired === true),
    ],
  );
}

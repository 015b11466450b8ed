import type { PoolClient } from 'pg';
import type { Principal } from '@ratewarden/shared/permissions';
import { siteScope } from '../../auth/authorize';

/**
 * What a checked case list reports (shared/src/periods.ts): every case of the uploader's sites
 * through one month. The month is the one the uploader named, else the later of the list's last
 * onset month and the latest month rostered at those sites when it was checked.
 */
export async function recordCaseReporting(client: PoolClient, intakeId: string, principal: Principal, reportsThrough: string | null): Promise<void> {
  const scope = siteScope(principal);
  await client.query(
    `WITH covered AS (SELECT coalesce($2::int[], (SELECT array_agg(id ORDER BY id) FROM sites), '{}') AS ids)
     UPDATE intakes i SET reports_site_ids = covered.ids,
       reports_through = coalesce($3::date, greatest(i.month_to, (SELECT max(month) FROM roster_slices rs WHERE rs.site_id = ANY(covered.ids))))
     FROM covered WHERE i.id = $1`,
    [intakeId, scope === 'all' ? null : scope, reportsThrough],
  );
}

import type { PoolClient } from 'pg';
import { attributingRow, onsetMonthOf, rosterMonthOf } from '@ratewarden/db/case-attribution';
import type { OrphanedCase } from '@ratewarden/shared/intake-schemas';
import type { RosterStage } from './roster-stage';

/** How many orphaned cases a diff names (the physician's list); the count is always whole. */
export const ORPHAN_LIST_CAP = 200;

/**
 * The stored current cases that applying the staged roster would leave without a roster row: a
 * case is attributed to its worker's roster row with hours in the onset month minus the outcome's
 * lag (db/src/case-attribution.ts); it is orphaned when such a row is current now, and after
 * apply none would be: the file replaces the slice that holds it (in `intake_stored_slices`,
 * made by rosterDiff) without a row with hours for that worker and month, and no other current
 * slice has one. Any status counts: a suspected case may be confirmed later. Returns the count
 * and the first ORPHAN_LIST_CAP cases, by onset.
 */
export async function orphanedCases(client: PoolClient, st: RosterStage): Promise<{ count: number; cases: OrphanedCase[] }> {
  const { rows } = await client.query<{
    n: string;
    case_ref: string | null;
    worker_key: string;
    outcome_code: string;
    onset: string;
    status: OrphanedCase['status'];
    site_code: string;
    month: string;
  }>(`
    WITH attributed AS (
      SELECT * FROM (
        SELECT c.case_ref, c.onset_date, c.status, upper(o.code) AS outcome_code, w.worker_key, c.worker_id,
               ${rosterMonthOf(onsetMonthOf('c.onset_date'), 'o.lag_months')} AS month
        FROM case_events c
        JOIN outcomes o ON o.id = c.outcome_id
        JOIN workers w ON w.id = c.worker_id
        WHERE c.superseded_by IS NULL
      ) a
      WHERE a.month IN (SELECT month FROM intake_stored_slices)
    ), losing AS (
      -- The row that attributes the case now (most hours, as the run picks it), in a slice the file replaces.
      SELECT a.*, ss.site_code
      FROM attributed a
      JOIN LATERAL (${attributingRow('a.worker_id', 'a.month', { columns: 'r.site_id' })}) cur ON true
      JOIN intake_stored_slices ss ON ss.site_id = cur.site_id AND ss.month = a.month
    ), orphaned AS (
      SELECT l.* FROM losing l
      WHERE NOT EXISTS (SELECT 1 FROM ${st.rows} s WHERE s.worker_key = l.worker_key AND s.month = l.month AND s.hours > 0)
        AND NOT EXISTS (
          SELECT 1 FROM roster_entries re
          JOIN roster_slices rs ON rs.intake_id = re.intake_id AND rs.site_id = re.site_id AND rs.month = re.month
          WHERE re.worker_id = l.worker_id AND re.month = l.month AND re.hours > 0
            AND NOT EXISTS (SELECT 1 FROM intake_stored_slices ss WHERE ss.site_id = re.site_id AND ss.month = re.month))
    )
    SELECT (SELECT count(*) FROM orphaned) AS n, x.case_ref, x.worker_key, x.outcome_code, to_char(x.onset_date, 'YYYY-MM-DD') AS onset, x.status, x.site_code,
           to_char(x.month, 'YYYY-MM') AS month
    FROM (SELECT 1) one LEFT JOIN LATERAL (SELECT * FROM orphaned ORDER BY onset_date, case_ref LIMIT ${ORPHAN_LIST_CAP}) x ON true`);
  const count = Number(rows[0]?.n ?? 0);
  const cases = rows
    .filter((r) => r.case_ref !== null)
    .map((r) => ({
      caseRef: r.case_ref!,
      workerKey: r.worker_key,
      outcomeCode: r.outcome_code,
      onsetDate: r.onset,
      status: r.status,
      siteCode: r.site_code,
      month: r.month,
    }));
  return { count, cases };
}

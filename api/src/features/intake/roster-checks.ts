import type { PoolClient } from 'pg';
import { columnPattern, reasons, rosterColumns } from '@ratewarden/shared/intake-columns';
import { cell, cellChecksInsertSql, lit } from './sql-checks';

const hoursDef = rosterColumns.find((c) => c.name === 'hours')!;
const monthPattern = columnPattern({ type: 'month' })!;

/** Codes known to the database, for the unknown-code checks. */
async function codeLists(client: PoolClient): Promise<[string[], string[]]> {
  const sites = await client.query<{ code: string }>(`SELECT upper(code) AS code FROM sites`);
  const groups = await client.query<{ code: string }>(`SELECT upper(code) AS code FROM exposure_groups`);
  return [sites.rows.map((r) => r.code), groups.rows.map((r) => r.code)];
}

/**
 * Every roster check, set-wise over the staging table `stg` (schema-qualified). Fills
 * `intake_problems`, and leaves two scratch tables the diff and the apply reuse:
 * `intake_slices` (site code × month of the file, with rows and hours) and `intake_workers`
 * (one line per worker key with the birth years and sexes it was given).
 */
export async function checkRoster(client: PoolClient, stg: string): Promise<void> {
  const [sites, groups] = await codeLists(client);
  await client.query(cellChecksInsertSql(stg, rosterColumns, { site: '$1', exposure_group: '$2' }), [sites, groups]);

  const hours = cell('s', 'hours');
  await client.query(`DROP TABLE IF EXISTS pg_temp.intake_slices, pg_temp.intake_workers`);
  await client.query(`
    CREATE TEMP TABLE intake_slices ON COMMIT DROP AS
    SELECT upper(${cell('s', 'site')}) AS site_code, ${cell('s', 'month')} AS m, count(*) AS n,
           sum(CASE WHEN ${hours} ~ ${lit(columnPattern(hoursDef.rule)!)} THEN replace(${hours}, ',', '.')::numeric END) AS hours
    FROM ${stg} s GROUP BY 1, 2`);
  await client.query(`
    CREATE TEMP TABLE intake_workers ON COMMIT DROP AS
    SELECT ${cell('s', 'worker_key')} AS k, min(${cell('s', 'birth_year')}) AS by_min, max(${cell('s', 'birth_year')}) AS by_max,
           min(upper(${cell('s', 'sex')})) AS sex_min, max(upper(${cell('s', 'sex')})) AS sex_max
    FROM ${stg} s GROUP BY 1`);

  // A worker twice in one month: every row of such a worker × month is named.
  await client.query(`
    INSERT INTO intake_problems (line, col, val, reason)
    SELECT s.line_no + 1, 'month', ${cell('s', 'month')}, ${lit(reasons.workerTwiceInMonth)}
    FROM ${stg} s
    JOIN (SELECT ${cell('x', 'worker_key')} AS k, ${cell('x', 'month')} AS m FROM ${stg} x GROUP BY 1, 2 HAVING count(*) > 1) d
      ON d.k = ${cell('s', 'worker_key')} AND d.m = ${cell('s', 'month')}`);

  // Birth year or sex that differ within the file or from the stored worker.
  await client.query(`
    INSERT INTO intake_problems (line, col, val, reason)
    SELECT s.line_no + 1, 'birth_year', ${cell('s', 'birth_year')} || ' / ' || upper(${cell('s', 'sex')}), ${lit(reasons.workerAttributesDiffer)}
    FROM ${stg} s
    JOIN (
      SELECT iw.k FROM intake_workers iw
      LEFT JOIN workers w ON w.worker_key = iw.k
      WHERE iw.by_min <> iw.by_max OR iw.sex_min <> iw.sex_max
         OR (w.id IS NOT NULL AND (w.birth_year::text IS DISTINCT FROM iw.by_min OR w.sex IS DISTINCT FROM iw.sex_min))
    ) d ON d.k = ${cell('s', 'worker_key')}`);

  // Stored current rosters of site × months this file does not replace, in the file's months.
  const { rows: other } = await client.query<{ n: string }>(`
    SELECT count(*) AS n FROM roster_slices rs JOIN sites si ON si.id = rs.site_id
    WHERE to_char(rs.month, 'YYYY-MM') IN (SELECT m FROM intake_slices)
      AND (upper(si.code), to_char(rs.month, 'YYYY-MM')) NOT IN (SELECT site_code, m FROM intake_slices)`);
  if (Number(other[0]!.n) > 0) {
    await client.query(`
      INSERT INTO intake_problems (line, col, val, reason)
      SELECT s.line_no + 1, 'site', ${cell('s', 'site')} || ' (stored at ' || si.code || ')', ${lit(reasons.workerTwiceStored)}
      FROM ${stg} s
      JOIN workers w ON w.worker_key = ${cell('s', 'worker_key')}
      JOIN roster_entries re ON re.worker_id = w.id
      JOIN roster_slices rs ON rs.intake_id = re.intake_id AND rs.site_id = re.site_id AND rs.month = re.month
      JOIN sites si ON si.id = re.site_id
      WHERE re.month = CASE WHEN ${cell('s', 'month')} ~ ${lit(monthPattern)} THEN (${cell('s', 'month')} || '-01')::date END
        AND (upper(si.code), to_char(re.month, 'YYYY-MM')) NOT IN (SELECT site_code, m FROM intake_slices)`);
  }
}

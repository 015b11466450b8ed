import type { PoolClient } from 'pg';
import { reasons } from '@ratewarden/shared/intake-columns';
import { AppError } from '../../lib/app-error';
import { addProblems } from './problems';
import type { RosterStage, RosterStaged } from './roster-stage';
import { lit } from './sql-checks';

/**
 * The roster checks left to SQL once the stream has judged every cell (shape, range, codes) and
 * tallied workers and site × months: the ones that need stored data, or, for a file whose months
 * do not simply increase per worker, the worker-twice-in-a-month check. `staged` is the stream's
 * result at upload time; at apply (staged rows intact, in-file checks already passed) it is null
 * and only the checks against the store run again. Returns the problems counted but not listed.
 */
export async function checkRoster(client: PoolClient, st: RosterStage, staged: RosterStaged | null): Promise<number> {
  let unlisted = 0;
  if (staged) {
    await addProblems(client, staged.problems);
    unlisted = staged.problemCount - staged.problems.length;
    if (staged.needsDuplicateCheck && !(await uniqueWorkerMonths(client, st))) {
      await client.query(`
        INSERT INTO intake_problems (line, col, val, reason)
        SELECT s.line_no, 'month', to_char(s.month, 'YYYY-MM'), ${lit(reasons.workerTwiceInMonth)}
        FROM ${st.rows} s
        JOIN (SELECT worker_key, month FROM ${st.rows} WHERE worker_key IS NOT NULL AND month IS NOT NULL GROUP BY 1, 2 HAVING count(*) > 1) d
          ON d.worker_key = s.worker_key AND d.month = s.month`);
    }
  }
  await assertCodesStillKnown(client, st, staged);

  // Birth year or sex that differ within the file or from the stored worker: the keys come from
  // the small per-worker table; the staged rows are read only when there is a key to name.
  const { rows: odd } = await client.query<{ k: string }>(`
    SELECT iw.k FROM ${st.workers} iw LEFT JOIN workers w ON w.worker_key = iw.k
    WHERE iw.by_min <> iw.by_max OR iw.sex_min <> iw.sex_max
       OR (w.id IS NOT NULL AND ((iw.by_min IS NOT NULL AND w.birth_year IS DISTINCT FROM iw.by_min) OR (iw.sex_min IS NOT NULL AND w.sex IS DISTINCT FROM iw.sex_min)))`);
  if (odd.length) {
    await client.query(
      `
      INSERT INTO intake_problems (line, col, val, reason)
      SELECT s.line_no, 'birth_year', coalesce(s.birth_year::text, '') || ' / ' || coalesce(s.sex, ''), ${lit(reasons.workerAttributesDiffer)}
      FROM ${st.rows} s WHERE s.worker_key = ANY($1::text[])`,
      [odd.map((r) => r.k)],
    );
  }

  // Stored current rosters of site × months this file does not replace, in the file's months.
  const { rows: other } = await client.query<{ n: string }>(`
    SELECT count(*) AS n FROM roster_slices rs
    WHERE rs.month IN (SELECT month FROM ${st.slices}) AND (rs.site_id, rs.month) NOT IN (SELECT site_id, month FROM ${st.slices})`);
  if (Number(other[0]!.n) > 0) {
    await client.query(`
      INSERT INTO intake_problems (line, col, val, reason)
      SELECT s.line_no, 'site', fs.code || ' (stored at ' || si.code || ')', ${lit(reasons.workerTwiceStored)}
      FROM ${st.rows} s
      JOIN sites fs ON fs.id = s.site_id
      JOIN workers w ON w.worker_key = s.worker_key
      JOIN roster_entries re ON re.worker_id = w.id AND re.month = s.month
      JOIN roster_slices rs ON rs.intake_id = re.intake_id AND rs.site_id = re.site_id AND rs.month = re.month
      JOIN sites si ON si.id = re.site_id
      WHERE (re.site_id, re.month) NOT IN (SELECT site_id, month FROM ${st.slices})`);
  }
  return unlisted;
}

/**
 * Codes were resolved to ids while streaming, before the intake lock was taken; a site or group
 * removed since then would leave rows pointing nowhere. At apply the ids are read from the stage.
 */
async function assertCodesStillKnown(client: PoolClient, st: RosterStage, staged: RosterStaged | null): Promise<void> {
  const siteIds = staged ? staged.siteIds : (await client.query<{ id: number }>(`SELECT DISTINCT site_id AS id FROM ${st.slices}`)).rows.map((r) => r.id);
  const groupIds = staged
    ? staged.groupIds
    : (await client.query<{ id: number }>(`SELECT DISTINCT group_id AS id FROM ${st.rows} WHERE group_id IS NOT NULL`)).rows.map((r) => r.id);
  const { rows } = await client.query<{ n: number }>(
    `SELECT (SELECT count(*)::int FROM sites WHERE id = ANY($1::int[])) + (SELECT count(*)::int FROM exposure_groups WHERE id = ANY($2::int[])) AS n`,
    [siteIds, groupIds],
  );
  if (rows[0]!.n !== siteIds.length + groupIds.length) {
    throw new AppError('conflict', 'a site or exposure group named in this file was removed while it was being checked; upload the file again');
  }
}

/**
 * True when no worker × month appears twice among the staged rows. Building a unique index is the
 * quickest way to know (one sort, no aggregate); only when it fails are the rows listed, by GROUP BY.
 */
async function uniqueWorkerMonths(client: PoolClient, st: RosterStage): Promise<boolean> {
  await client.query(`SAVEPOINT worker_months`);
  try {
    await client.query(`CREATE UNIQUE INDEX ON ${st.rows} (worker_key, month)`);
    await client.query(`RELEASE SAVEPOINT worker_months`);
    return true;
  } catch (err) {
    if ((err as { code?: string }).code !== '23505') throw err;
    await client.query(`ROLLBACK TO SAVEPOINT worker_months`);
    return false;
  }
}

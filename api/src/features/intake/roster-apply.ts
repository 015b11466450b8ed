import type { PoolClient } from 'pg';
import { ROSTER_DIFF_WORKER_CAP, type IntakeDiff, type RosterSliceDiff } from '@ratewarden/shared/intake-schemas';
import { orphanedCases } from './roster-orphans';
import type { RosterStage } from './roster-stage';

const sliceJoin = `rs.intake_id = re.intake_id AND rs.site_id = re.site_id AND rs.month = re.month`;

/** Site ids and month range of a staged roster (from its site × month table). */
export async function rosterScope(client: PoolClient, st: RosterStage): Promise<{ siteIds: number[]; monthFrom: string | null; monthTo: string | null }> {
  const { rows } = await client.query<{ site_ids: number[] | null; month_from: string | null; month_to: string | null }>(`
    SELECT array_agg(DISTINCT site_id ORDER BY site_id) AS site_ids, to_char(min(month), 'YYYY-MM-DD') AS month_from, to_char(max(month), 'YYYY-MM-DD') AS month_to
    FROM ${st.slices}`);
  const r = rows[0]!;
  return { siteIds: r.site_ids ?? [], monthFrom: r.month_from, monthTo: r.month_to };
}

/**
 * What applying the roster would change, per site × month already stored: workers added, removed,
 * moved to another group, hours changed, each named (the first ROSTER_DIFF_WORKER_CAP keys), and
 * the stored cases it would leave without a roster row (roster-orphans.ts). Only the stored slices
 * are compared row by row; a slice that is new is summarized from the staged site × month table.
 */
export async function rosterDiff(client: PoolClient, st: RosterStage): Promise<IntakeDiff> {
  await client.query(`DROP TABLE IF EXISTS pg_temp.intake_stored_slices`);
  await client.query(`
    CREATE TEMP TABLE intake_stored_slices ON COMMIT DROP AS
    SELECT sl.site_code, sl.m, sl.site_id, sl.month, rs.intake_id
    FROM ${st.slices} sl JOIN roster_slices rs ON rs.site_id = sl.site_id AND rs.month = sl.month`);
  const { rows: storedCount } = await client.query<{ n: string }>(`SELECT count(*) AS n FROM intake_stored_slices`);
  // Nothing stored for these months: every slice is new, no row-by-row comparison is needed.
  const { rows: changed } =
    Number(storedCount[0]!.n) === 0
      ? { rows: [] }
      : await client.query<{
          site_code: string;
          m: string;
          added: string;
          removed: string;
          moved: string;
          hours_changed: string;
          unchanged: string;
          stored_hours: string | null;
          new_hours: string | null;
          ex_added: string[] | null;
          ex_removed: string[] | null;
          ex_moved: string[] | null;
          ex_hours: string[] | null;
        }>(`
    WITH f AS (
      SELECT s.worker_key AS k, ss.site_code, ss.m, s.group_id AS g, s.hours AS h
      FROM ${st.rows} s JOIN intake_stored_slices ss ON ss.site_id = s.site_id AND ss.month = s.month
    ), o AS (
      SELECT w.worker_key AS k, ss.site_code, ss.m, re.exposure_group_id AS g, re.hours AS h
      FROM intake_stored_slices ss
      JOIN roster_entries re ON re.intake_id = ss.intake_id AND re.site_id = ss.site_id AND re.month = ss.month
      JOIN workers w ON w.id = re.worker_id
    ), j AS (
      SELECT coalesce(f.site_code, o.site_code) AS site_code, coalesce(f.m, o.m) AS m, coalesce(f.k, o.k) AS k, f.h AS fh, o.h AS oh,
             CASE WHEN o.k IS NULL THEN 'added' WHEN f.k IS NULL THEN 'removed' WHEN f.g <> o.g THEN 'moved' WHEN f.h <> o.h THEN 'hours' ELSE 'same' END AS change
      FROM f FULL JOIN o ON f.k = o.k AND f.site_code = o.site_code AND f.m = o.m
    )
    SELECT site_code, m,
      count(*) FILTER (WHERE change = 'added') AS added, count(*) FILTER (WHERE change = 'removed') AS removed,
      count(*) FILTER (WHERE change = 'moved') AS moved, count(*) FILTER (WHERE change = 'hours') AS hours_changed,
      count(*) FILTER (WHERE change = 'same') AS unchanged, sum(oh) AS stored_hours, sum(fh) AS new_hours,
      (array_agg(k ORDER BY k) FILTER (WHERE change = 'added'))[1:${ROSTER_DIFF_WORKER_CAP}] AS ex_added,
      (array_agg(k ORDER BY k) FILTER (WHERE change = 'removed'))[1:${ROSTER_DIFF_WORKER_CAP}] AS ex_removed,
      (array_agg(k ORDER BY k) FILTER (WHERE change = 'moved'))[1:${ROSTER_DIFF_WORKER_CAP}] AS ex_moved,
      (array_agg(k ORDER BY k) FILTER (WHERE change = 'hours'))[1:${ROSTER_DIFF_WORKER_CAP}] AS ex_hours
    FROM j GROUP BY site_code, m`);
  const { rows: fresh } = await client.query<{ site_code: string; m: string; n: string; hours: string | null }>(`
    SELECT sl.site_code, sl.m, sl.n, sl.hours FROM ${st.slices} sl
    WHERE NOT EXISTS (SELECT 1 FROM intake_stored_slices ss WHERE ss.site_id = sl.site_id AND ss.month = sl.month)`);
  const { rows: nw } = await client.query<{ n: string }>(
    `SELECT count(*) AS n FROM ${st.workers} iw WHERE NOT EXISTS (SELECT 1 FROM workers w WHERE w.worker_key = iw.k)`,
  );
  // Only a slice already stored can lose a row a case is attributed to.
  const orphans = changed.length === 0 ? { count: 0, cases: [] } : await orphanedCases(client, st);

  const slices: RosterSliceDiff[] = [
    ...changed.map((r) => ({
      siteCode: r.site_code,
      month: r.m,
      stored: true,
      rows: Number(r.added) + Number(r.moved) + Number(r.hours_changed) + Number(r.unchanged),
      added: Number(r.added),
      removed: Number(r.removed),
      moved: Number(r.moved),
      hoursChanged: Number(r.hours_changed),
      unchanged: Number(r.unchanged),
      storedHours: Number(r.stored_hours ?? 0),
      newHours: Number(r.new_hours ?? 0),
      workers: { added: r.ex_added ?? [], removed: r.ex_removed ?? [], moved: r.ex_moved ?? [], hoursChanged: r.ex_hours ?? [] },
    })),
    ...fresh.map((r) => ({
      siteCode: r.site_code,
      month: r.m,
      stored: false,
      rows: Number(r.n),
      added: Number(r.n),
      removed: 0,
      moved: 0,
      hoursChanged: 0,
      unchanged: 0,
      storedHours: 0,
      newHours: Number(r.hours ?? 0),
      workers: { added: [], removed: [], moved: [], hoursChanged: [] },
    })),
  ].sort((a, b) => a.siteCode.localeCompare(b.siteCode) || a.month.localeCompare(b.month));
  const sum = (k: 'added' | 'removed' | 'moved' | 'hoursChanged' | 'unchanged') => slices.reduce((t, s) => t + s[k], 0);
  return {
    kind: 'roster',
    newWorkers: Number(nw[0]!.n),
    slices,
    totals: {
      added: sum('added'),
      removed: sum('removed'),
      moved: sum('moved'),
      hoursChanged: sum('hoursChanged'),
      unchanged: sum('unchanged'),
      newSlices: fresh.length,
      replacedSlices: changed.length,
    },
    // Stored whole; the API withholds the cases and a small count from readers without `cases:read` (intake-disclosure.ts).
    orphanedCases: { count: orphans.count, withheld: null, cases: orphans.cases },
  };
}

/**
 * Stores a checked roster: new workers, every row as a roster entry of this intake, and the
 * site × month pointers moved to it. Intakes left holding no current slice become superseded.
 * Runs inside the caller's transaction; the checks have passed, so every staged cell is set.
 * The entries go in primary-key order (worker, month), so the index grows at its right edge.
 */
export async function applyRoster(client: PoolClient, st: RosterStage, intakeId: string): Promise<{ superseded: string[] }> {
  await client.query(
    `
    INSERT INTO workers (worker_key, birth_year, sex, first_intake_id)
    SELECT iw.k, iw.by_min, iw.sex_min, $1 FROM ${st.workers} iw
    ON CONFLICT (worker_key) DO NOTHING`,
    [intakeId],
  );
  await client.query(
    `
    INSERT INTO roster_entries (intake_id, worker_id, month, site_id, exposure_group_id, hours, job_title)
    SELECT $1, w.id, s.month, s.site_id, s.group_id, s.hours, s.job_title
    FROM ${st.rows} s JOIN workers w ON w.worker_key = s.worker_key
    ORDER BY w.id, s.month`,
    [intakeId],
  );
  const { rows: prev } = await client.query<{ intake_id: string }>(`
    SELECT DISTINCT rs.intake_id FROM roster_slices rs JOIN ${st.slices} sl ON sl.site_id = rs.site_id AND sl.month = rs.month`);
  await client.query(
    `
    INSERT INTO roster_slices (site_id, month, intake_id)
    SELECT site_id, month, $1 FROM ${st.slices}
    ON CONFLICT (site_id, month) DO UPDATE SET intake_id = EXCLUDED.intake_id`,
    [intakeId],
  );
  return {
    superseded: await markSupersededRosters(
      client,
      prev.map((r) => r.intake_id),
    ),
  };
}

/** Applied roster intakes among `candidates` that no longer hold any current slice become superseded. */
export async function markSupersededRosters(client: PoolClient, candidates: string[]): Promise<string[]> {
  if (!candidates.length) return [];
  const { rows } = await client.query<{ id: string }>(
    `
    UPDATE intakes i SET state = 'superseded', superseded_at = now()
    WHERE i.id = ANY($1::uuid[]) AND i.state = 'applied' AND NOT EXISTS (SELECT 1 FROM roster_slices rs WHERE rs.intake_id = i.id)
    RETURNING i.id`,
    [candidates],
  );
  return rows.map((r) => r.id);
}

/**
 * Makes a superseded roster intake current again: every site × month it brought points back at it.
 * Refuses (returns the clashes) when that would put a worker on two sites in one month.
 */
export async function restoreRoster(client: PoolClient, intakeId: string): Promise<{ superseded: string[]; clashes: number }> {
  const { rows: prev } = await client.query<{ intake_id: string }>(
    `
    SELECT DISTINCT rs.intake_id FROM roster_slices rs
    JOIN (SELECT DISTINCT site_id, month FROM roster_entries WHERE intake_id = $1) mine ON mine.site_id = rs.site_id AND mine.month = rs.month
    WHERE rs.intake_id <> $1`,
    [intakeId],
  );
  await client.query(
    `
    INSERT INTO roster_slices (site_id, month, intake_id)
    SELECT DISTINCT site_id, month, intake_id FROM roster_entries WHERE intake_id = $1
    ON CONFLICT (site_id, month) DO UPDATE SET intake_id = EXCLUDED.intake_id`,
    [intakeId],
  );
  const { rows: clash } = await client.query<{ n: string }>(
    `
    SELECT count(*) AS n FROM (
      SELECT re.worker_id, re.month FROM roster_entries re JOIN roster_slices rs ON ${sliceJoin}
      WHERE re.worker_id IN (SELECT worker_id FROM roster_entries WHERE intake_id = $1)
      GROUP BY re.worker_id, re.month HAVING count(*) > 1) d`,
    [intakeId],
  );
  return {
    superseded: await markSupersededRosters(
      client,
      prev.map((r) => r.intake_id),
    ),
    clashes: Number(clash[0]!.n),
  };
}

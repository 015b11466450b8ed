import type { PoolClient } from 'pg';
import { attributingRow, onsetMonthOf, rosterMonthOf } from '@ratewarden/db/case-attribution';
import type { CellBounds } from '@ratewarden/shared/intake-cell';
import { caseColumns, reasons } from '@ratewarden/shared/intake-columns';
import type { CaseStatus } from '@ratewarden/shared/intake';
import type { IntakeDiff } from '@ratewarden/shared/intake-schemas';
import { cell, cellChecksInsertSql, isCalendarDateSql, lit } from './sql-checks';

const onsetRule = caseColumns.find((c) => c.name === 'onset_date')!.rule;

const current = `rs.intake_id = re.intake_id AND rs.site_id = re.site_id AND rs.month = re.month`;

/**
 * Every case-list check over the staging table. Leaves `intake_cases`: the well-formed rows typed
 * and resolved to worker and outcome ids, with the current stored version of the same case_ref
 * (and the physician's review, when that version is a decision).
 */
export async function checkCases(client: PoolClient, stg: string, bounds: CellBounds): Promise<void> {
  const outcomes = (await client.query<{ code: string }>(`SELECT upper(code) AS code FROM outcomes`)).rows.map((r) => r.code);
  for (const sql of cellChecksInsertSql(stg, caseColumns, { outcome: outcomes }, bounds)) await client.query(sql);

  await client.query(`
    INSERT INTO intake_problems (line, col, val, reason)
    SELECT s.line_no + 1, 'case_ref', ${cell('s', 'case_ref')}, ${lit(reasons.caseRefTwice)}
    FROM ${stg} s JOIN (SELECT ${cell('x', 'case_ref')} AS r FROM ${stg} x GROUP BY 1 HAVING count(*) > 1) d ON d.r = ${cell('s', 'case_ref')}`);

  await client.query(`DROP TABLE IF EXISTS pg_temp.intake_cases`);
  await client.query(`
    CREATE TEMP TABLE intake_cases ON COMMIT DROP AS
    SELECT s.line_no, ${cell('s', 'case_ref')} AS case_ref, ${cell('s', 'worker_key')} AS worker_key, w.id AS worker_id, o.id AS outcome_id,
           upper(o.code) AS outcome_code, ${cell('s', 'onset_date')}::date AS onset_date, lower(${cell('s', 'status')}) AS status,
           ce.id AS stored_id, ce.worker_id AS stored_worker, ce.outcome_id AS stored_outcome, ce.onset_date AS stored_onset, ce.status AS stored_status, ce.review_id AS stored_review
    FROM ${stg} s
    JOIN outcomes o ON upper(o.code) = upper(${cell('s', 'outcome')})
    LEFT JOIN workers w ON w.worker_key = ${cell('s', 'worker_key')}
    LEFT JOIN case_events ce ON ce.case_ref = ${cell('s', 'case_ref')} AND ce.superseded_by IS NULL
    WHERE ${isCalendarDateSql(cell('s', 'onset_date'), onsetRule)}`);
  // Autovacuum never analyzes a temporary table: without statistics the duplicate check below
  // compared every case with every other (2.1 s for 4,613 cases instead of a hash join).
  await client.query(`ANALYZE pg_temp.intake_cases`);

  await client.query(`
    INSERT INTO intake_problems (line, col, val, reason)
    SELECT c.line_no + 1, 'worker_key', c.worker_key, ${lit(reasons.caseWorkerNotRostered)}
    FROM intake_cases c
    WHERE c.worker_id IS NULL OR NOT EXISTS (
      SELECT 1 FROM roster_entries re JOIN roster_slices rs ON ${current} WHERE re.worker_id = c.worker_id)`);
  await client.query(`
    INSERT INTO intake_problems (line, col, val, reason)
    SELECT c.line_no + 1, 'onset_date', c.onset_date::text, ${lit(reasons.caseOutsideRoster)}
    FROM intake_cases c
    WHERE c.worker_id IS NOT NULL
      AND EXISTS (SELECT 1 FROM roster_entries re JOIN roster_slices rs ON ${current} WHERE re.worker_id = c.worker_id)
      AND NOT EXISTS (SELECT 1 FROM roster_entries re JOIN roster_slices rs ON ${current}
                      WHERE re.worker_id = c.worker_id AND re.month = date_trunc('month', c.onset_date)::date)`);

  // The same worker × outcome × onset under two case references: within the file or against the store
  // (a stored case whose reference the file gives again is judged by the file's version). Two
  // uncorrelated joins: as correlated EXISTS ... OR EXISTS they compared every case with every other
  // (1.7 s for 4,613 cases, against 6 ms).
  await client.query(`
    INSERT INTO intake_problems (line, col, val, reason)
    SELECT c.line_no + 1, 'case_ref', c.case_ref, ${lit(reasons.caseDuplicateEvent)}
    FROM intake_cases c
    WHERE c.line_no IN (
      SELECT a.line_no FROM intake_cases a
      JOIN intake_cases d ON d.worker_id = a.worker_id AND d.outcome_id = a.outcome_id AND d.onset_date = a.onset_date AND d.case_ref <> a.case_ref
      UNION
      SELECT a.line_no FROM intake_cases a
      JOIN case_events e ON e.superseded_by IS NULL AND e.worker_id = a.worker_id AND e.outcome_id = a.outcome_id AND e.onset_date = a.onset_date
        AND e.case_ref <> a.case_ref
      WHERE NOT EXISTS (SELECT 1 FROM intake_cases x WHERE x.case_ref = e.case_ref))`);
}

/** Sites of the rostered months the cases fall in, for site scoping. */
export async function caseScope(client: PoolClient): Promise<{ siteIds: number[]; monthFrom: string | null; monthTo: string | null }> {
  const { rows } = await client.query<{ site_ids: number[] | null; month_from: string | null; month_to: string | null }>(`
    SELECT (SELECT array_agg(DISTINCT re.site_id ORDER BY re.site_id) FROM intake_cases c
            JOIN roster_entries re ON re.worker_id = c.worker_id AND re.month = date_trunc('month', c.onset_date)::date
            JOIN roster_slices rs ON ${current}) AS site_ids,
           to_char(date_trunc('month', min(onset_date)), 'YYYY-MM-DD') AS month_from, to_char(date_trunc('month', max(onset_date)), 'YYYY-MM-DD') AS month_to
    FROM intake_cases`);
  const r = rows[0]!;
  return { siteIds: r.site_ids ?? [], monthFrom: r.month_from, monthTo: r.month_to };
}

/** A case of the file that changes its stored version; `t` qualifies the columns of intake_cases. */
const changedOf = (t = '') =>
  `${t}stored_id IS NOT NULL AND (${t}stored_worker <> ${t}worker_id OR ${t}stored_outcome <> ${t}outcome_id OR ${t}stored_onset <> ${t}onset_date OR ${t}stored_status <> ${t}status)`;
const changedWhere = changedOf();

/**
 * What applying the case list changes: new, changed and unchanged cases, per outcome, and the new
 * and changed ones split by outcome × status × exposure group, the group of the roster row that
 * attributes the case as a run would (db/src/case-attribution.ts; null when there is none). Stored with every count; the API withholds small ones
 * from readers without `cases:read` (intake-disclosure.ts).
 */
export async function caseDiff(client: PoolClient): Promise<IntakeDiff> {
  const { rows } = await client.query<{ outcome_code: string; new: string; changed: string; unchanged: string }>(`
    SELECT outcome_code, count(*) FILTER (WHERE stored_id IS NULL) AS new, count(*) FILTER (WHERE ${changedWhere}) AS changed,
           count(*) FILTER (WHERE stored_id IS NOT NULL AND NOT (${changedWhere})) AS unchanged
    FROM intake_cases GROUP BY outcome_code ORDER BY outcome_code`);
  const { rows: split } = await client.query<{ outcome_code: string; status: CaseStatus; group_code: string | null; new: string; changed: string }>(`
    SELECT c.outcome_code, c.status, g.code AS group_code,
           count(*) FILTER (WHERE c.stored_id IS NULL) AS new, count(*) FILTER (WHERE ${changedOf('c.')}) AS changed
    FROM intake_cases c
    JOIN outcomes o ON o.id = c.outcome_id
    LEFT JOIN LATERAL (${attributingRow('c.worker_id', rosterMonthOf(onsetMonthOf('c.onset_date'), 'o.lag_months'))}) a ON true
    LEFT JOIN exposure_groups g ON g.id = a.exposure_group_id
    WHERE c.stored_id IS NULL OR ${changedOf('c.')}
    GROUP BY 1, 2, 3 ORDER BY 1, 2, 3 NULLS LAST`);
  const n = (k: 'new' | 'changed' | 'unchanged') => rows.reduce((t, r) => t + Number(r[k]), 0);
  const shown = (count: string) => ({ count: Number(count), withheld: null });
  return {
    kind: 'cases',
    new: n('new'),
    changed: n('changed'),
    unchanged: n('unchanged'),
    byOutcome: rows.map((r) => ({ outcomeCode: r.outcome_code, new: Number(r.new), changed: Number(r.changed), newWithheld: null, changedWithheld: null })),
    split: split.map((r) => ({ outcomeCode: r.outcome_code, status: r.status, groupCode: r.group_code, new: shown(r.new), changed: shown(r.changed) })),
  };
}

/**
 * Stores new and changed cases as events of this intake; the version a change replaces stays,
 * marked as superseded by this intake. Unchanged cases are not stored again.
 */
export async function applyCases(client: PoolClient, intakeId: string): Promise<{ superseded: string[] }> {
  const { rows: prev } = await client.query<{ intake_id: string }>(
    `
    UPDATE case_events e SET superseded_by = $1 FROM intake_cases c
    WHERE e.id = c.stored_id AND (c.stored_worker <> c.worker_id OR c.stored_outcome <> c.outcome_id OR c.stored_onset <> c.onset_date OR c.stored_status <> c.status)
    RETURNING e.intake_id`,
    [intakeId],
  );
  await client.query(
    `
    INSERT INTO case_events (intake_id, case_ref, worker_id, outcome_id, onset_date, status)
    SELECT $1, case_ref, worker_id, outcome_id, onset_date, status FROM intake_cases
    WHERE stored_id IS NULL OR ${changedWhere}`,
    [intakeId],
  );
  return { superseded: await markSupersededCases(client, [...new Set(prev.map((r) => r.intake_id))]) };
}

/** Applied case intakes among `candidates` with no current event left become superseded. */
export async function markSupersededCases(client: PoolClient, candidates: string[]): Promise<string[]> {
  if (!candidates.length) return [];
  const { rows } = await client.query<{ id: string }>(
    `
    UPDATE intakes i SET state = 'superseded', superseded_at = now()
    WHERE i.id = ANY($1::uuid[]) AND i.state = 'applied'
      AND NOT EXISTS (SELECT 1 FROM case_events e WHERE e.intake_id = i.id AND e.superseded_by IS NULL)
    RETURNING i.id`,
    [candidates],
  );
  return rows.map((r) => r.id);
}

/** Makes every case version of a superseded case intake current again. */
export async function restoreCases(client: PoolClient, intakeId: string): Promise<{ superseded: string[] }> {
  const { rows: prev } = await client.query<{ intake_id: string }>(
    `
    UPDATE case_events cur SET superseded_by = $1
    FROM case_events mine
    WHERE mine.intake_id = $1 AND cur.case_ref = mine.case_ref AND cur.superseded_by IS NULL AND cur.intake_id <> $1
    RETURNING cur.intake_id`,
    [intakeId],
  );
  // Versions a physician's review replaced stay replaced: the review's version is the intake's current one.
  await client.query(`UPDATE case_events SET superseded_by = NULL WHERE intake_id = $1 AND superseded_by_review IS NULL`, [intakeId]);
  return { superseded: await markSupersededCases(client, [...new Set(prev.map((r) => r.intake_id))]) };
}

import type { DataSource, EntityManager } from 'typeorm';
import { attributingRow, countedByRule, onsetMonthOf, rosterMonthOf } from '@ratewarden/db/case-attribution';
import type { CaseListQuery, CaseSummary } from '@ratewarden/shared/cases';
import type { Principal } from '@ratewarden/shared/permissions';
import { siteScope } from '../../auth/authorize';
import { readsEverySite } from '../../disclosure/run-frame';

type Db = DataSource | EntityManager;

/** A row of the register as REGISTER_SQL reads it: what toSummary shows (the statement's other columns serve its filters). */
interface RegisterRow {
  case_ref: string;
  worker_key: string;
  outcome_id: number;
  outcome_code: string;
  /** The onset as YYYY-MM-DD. */
  onset: string;
  status: CaseSummary['status'];
  site_id: number | null;
  exposure_group_id: number | null;
  intake_id: string;
  file_name: string;
  review_id: string | null;
  versions: number;
  run_id: string | null;
  attribution: CaseSummary['attribution']['state'];
  attribution_reason: string | null;
}

/**
 * The current version of every case with what the register shows of it: the site and exposure
 * group it is attributed to as a run would (db/src/case-attribution.ts), the intake it came from,
 * its number of versions, and how the current run saw it (its `run_unattributed` row; its status
 * among the run's counted ones; a version made after the run started was not counted by it; a
 * later case of a first-event outcome is not counted). Parameters: $1 site scope (null:
 * every site), $2 whether unattributed cases are in scope (a reader of every site).
 */
const REGISTER_SQL = `
  WITH cr AS (
    SELECT r.id, r.started_at, ARRAY(SELECT jsonb_array_elements_text(r.settings->'countedStatuses')) AS statuses
    FROM current_run c JOIN runs r ON r.id = c.run_id
  ),
  cur AS (
    SELECT c.id, c.case_ref, c.worker_id, c.outcome_id, c.onset_date, c.status, c.intake_id, c.review_id, c.created_at,
           w.worker_key, o.code AS outcome_code, o.lag_months, o.counting_rule, i.file_name, a.site_id, a.exposure_group_id
    FROM case_events c
    JOIN workers w ON w.id = c.worker_id
    JOIN outcomes o ON o.id = c.outcome_id
    JOIN intakes i ON i.id = c.intake_id
    LEFT JOIN LATERAL (${attributingRow('c.worker_id', rosterMonthOf(onsetMonthOf('c.onset_date'), 'o.lag_months'))}) a ON true
    WHERE c.superseded_by IS NULL
  )
  SELECT cur.*, to_char(cur.onset_date, 'YYYY-MM-DD') AS onset,
         (SELECT count(*) FROM case_events v WHERE v.case_ref = cur.case_ref)::int AS versions,
         cr.id AS run_id,
         CASE WHEN cr.id IS NULL THEN 'no_run'
              WHEN u.reason IS NOT NULL THEN 'unattributed'
              WHEN cur.created_at > cr.started_at THEN 'not_counted'
              WHEN NOT (cur.status = ANY(cr.statuses)) THEN 'not_counted'
              WHEN NOT ${countedByRule('cur', 'cur.counting_rule', 'cr.statuses')} THEN 'not_counted'
              ELSE 'attributed' END AS attribution,
         CASE WHEN cr.id IS NULL THEN NULL
              WHEN u.reason IS NOT NULL THEN u.reason
              WHEN cur.created_at > cr.started_at THEN 'changed after the run: the next run counts this version'
              WHEN NOT (cur.status = ANY(cr.statuses)) THEN 'status not counted by the run'
              WHEN NOT ${countedByRule('cur', 'cur.counting_rule', 'cr.statuses')} THEN 'a later case of a first-event outcome: the run counts the worker''s first only'
              ELSE NULL END AS attribution_reason
  FROM cur
  LEFT JOIN cr ON true
  LEFT JOIN run_unattributed u ON u.run_id = cr.id AND u.case_event_id = cur.id
  WHERE ($1::int[] IS NULL OR cur.site_id = ANY($1::int[]) OR (cur.site_id IS NULL AND $2::boolean))`;

/** The site scope of a reader of cases, as the register's SQL takes it. */
export async function caseScope(db: Db, principal: Principal): Promise<[number[] | null, boolean]> {
  const scope = siteScope(principal);
  return [scope === 'all' ? null : scope, await readsEverySite(db, principal)];
}

function toSummary(r: RegisterRow): CaseSummary {
  return {
    caseRef: r.case_ref,
    workerKey: r.worker_key,
    outcomeId: r.outcome_id,
    outcomeCode: r.outcome_code,
    onsetDate: r.onset,
    status: r.status,
    siteId: r.site_id,
    exposureGroupId: r.exposure_group_id,
    intakeId: r.intake_id,
    intakeFileName: r.file_name,
    reviewed: r.review_id !== null,
    versions: r.versions,
    attribution: { runId: r.run_id, state: r.attribution, reason: r.attribution_reason },
  };
}

/** The register: current cases within the reader's sites, filtered; newest onset first. */
export async function queryCases(db: Db, principal: Principal, q: CaseListQuery): Promise<CaseSummary[]> {
  const [sites, everySite] = await caseScope(db, principal);
  const rows: RegisterRow[] = await db.query(
    `SELECT * FROM (${REGISTER_SQL}) x
     WHERE ($3::int IS NULL OR outcome_id = $3) AND ($4::int IS NULL OR exposure_group_id = $4) AND ($5::int IS NULL OR site_id = $5)
       AND ($6::text IS NULL OR status = $6) AND ($7::date IS NULL OR onset_date >= $7) AND ($8::date IS NULL OR onset_date < ($8::date + interval '1 month'))
       AND ($9::text IS NULL OR strpos(lower(case_ref), lower($9)) > 0 OR strpos(lower(worker_key), lower($9)) > 0)
     ORDER BY onset_date DESC, case_ref LIMIT $10`,
    [sites, everySite, q.outcomeId ?? null, q.exposureGroupId ?? null, q.siteId ?? null, q.status ?? null, q.from ?? null, q.to ?? null, q.q || null, q.limit],
  );
  return rows.map(toSummary);
}

/** One current case within the reader's sites, or null. */
export async function queryCase(db: Db, principal: Principal, caseRef: string): Promise<CaseSummary | null> {
  const [sites, everySite] = await caseScope(db, principal);
  const [row]: RegisterRow[] = await db.query(`SELECT * FROM (${REGISTER_SQL}) x WHERE case_ref = $3`, [sites, everySite, caseRef]);
  return row ? toSummary(row) : null;
}

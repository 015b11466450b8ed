import type { DataSource } from 'typeorm';
import { toJsonValue } from '@ratewarden/shared/stats';
import type { Principal } from '@ratewarden/shared/permissions';
import type { RunDetail, RunDiff, RunRequested, RunResult, RunResultsQuery, RunSummary } from '@ratewarden/shared/runs';
import { recordAudit } from '../../audit/audit-log';
import { AppError } from '../../lib/app-error';

type Row = Record<string, any>;

const runCols = `r.id, r.number, r.trigger, r.reason, r.state, r.started_at, r.finished_at, r.error, r.code_version,
  r.inputs, r.settings, r.worker, r.summary, (cr.run_id IS NOT NULL) AS is_current`;
const runFrom = `runs r LEFT JOIN current_run cr ON cr.run_id = r.id`;

const iso = (d: Date | string | null): string | null => (d === null ? null : new Date(d).toISOString());

function summaryOf(r: Row): RunSummary {
  return {
    id: r.id,
    number: Number(r.number),
    trigger: r.trigger,
    reason: r.reason,
    state: r.state,
    isCurrent: r.is_current,
    startedAt: iso(r.started_at)!,
    finishedAt: iso(r.finished_at),
    error: r.error,
    codeVersion: r.code_version,
    resultCount: typeof r.summary?.results === 'number' ? r.summary.results : null,
  };
}

function detailOf(r: Row): RunDetail {
  return {
    ...summaryOf(r),
    inputs: { rosterIntakeIds: r.inputs.rosterIntakeIds ?? [], caseIntakeIds: r.inputs.caseIntakeIds ?? [], requestIds: r.inputs.requestIds ?? [] },
    settings: r.settings,
    worker: r.worker,
    summary: r.summary,
  };
}

export async function listRuns(ds: DataSource, limit = 100): Promise<RunSummary[]> {
  const rows: Row[] = await ds.query(`SELECT ${runCols} FROM ${runFrom} ORDER BY r.number DESC LIMIT $1`, [limit]);
  return rows.map(summaryOf);
}

export async function getRun(ds: DataSource, id: string | 'current'): Promise<RunDetail> {
  const rows: Row[] =
    id === 'current'
      ? await ds.query(`SELECT ${runCols} FROM current_run c JOIN runs r ON r.id = c.run_id LEFT JOIN current_run cr ON cr.run_id = r.id`)
      : await ds.query(`SELECT ${runCols} FROM ${runFrom} WHERE r.id = $1`, [id]);
  if (!rows[0]) throw new AppError('not_found', id === 'current' ? 'no run has succeeded yet' : 'no such run');
  return detailOf(rows[0]);
}

const n = (v: unknown) => toJsonValue(v) as number | 'Infinity' | '-Infinity' | null;
const limits = (r: Row, p: string) => ({ estimate: n(r[p]), lower: n(r[`${p}_lower`]), upper: n(r[`${p}_upper`]) });

function resultOf(r: Row): RunResult {
  return {
    outcomeId: r.outcome_id,
    exposureGroupId: r.exposure_group_id,
    window: r.window_kind,
    period: r.period_iso,
    monthsCovered: r.months_covered,
    isReference: r.is_reference,
    referenceGroupId: r.reference_group_id,
    cases: r.cases,
    hours: r.hours,
    personTime: r.person_time,
    rate: limits(r, 'rate'),
    expected: r.expected,
    irr: { ...limits(r, 'irr'), p: r.irr_p, waldLower: n(r.irr_wald_lower), waldUpper: n(r.irr_wald_upper) },
    ird: { ...limits(r, 'ird'), p: r.ird_p },
    mhAge: { irr: { ...limits(r, 'mh_age_irr'), p: r.mh_age_irr_p }, ird: limits(r, 'mh_age_ird') },
    mhSite: { irr: { ...limits(r, 'mh_site_irr'), p: r.mh_site_irr_p }, ird: limits(r, 'mh_site_ird') },
    uChart: { centre: r.u_centre, lcl: r.u_lcl, ucl: r.u_ucl, signal: r.u_signal },
    detail: toJsonValue(r.detail) as Record<string, unknown>,
  };
}

/** The results of one run, filtered; ordered by outcome, group, window and period. */
export async function listResults(ds: DataSource, runId: string, q: RunResultsQuery): Promise<RunResult[]> {
  await getRun(ds, runId);
  const rows: Row[] = await ds.query(
    `SELECT *, to_char(period, 'YYYY-MM-DD') AS period_iso FROM run_results
     WHERE run_id = $1 AND ($2::int IS NULL OR outcome_id = $2) AND ($3::int IS NULL OR exposure_group_id = $3)
       AND ($4::text IS NULL OR window_kind = $4) AND ($5::date IS NULL OR period >= $5) AND ($6::date IS NULL OR period <= $6)
     ORDER BY outcome_id, exposure_group_id, window_kind, period`,
    [runId, q.outcomeId ?? null, q.exposureGroupId ?? null, q.window ?? null, q.from ?? null, q.to ?? null],
  );
  return rows.map(resultOf);
}

/**
 * What changed between two runs: every result cell (outcome × group × window × period) added,
 * removed, or with different cases, hours, rate or IRR. Restated numbers are never overwritten,
 * so both sides are read as they were stored.
 */
export async function diffRuns(ds: DataSource, fromId: string, toId: string): Promise<RunDiff> {
  const [from, to] = [await getRun(ds, fromId), await getRun(ds, toId)];
  const rows: Row[] = await ds.query(
    `WITH a AS (SELECT * FROM run_results WHERE run_id = $1), b AS (SELECT * FROM run_results WHERE run_id = $2)
     SELECT coalesce(a.outcome_id, b.outcome_id) AS outcome_id, coalesce(a.exposure_group_id, b.exposure_group_id) AS exposure_group_id,
            coalesce(a.window_kind, b.window_kind) AS window_kind, to_char(coalesce(a.period, b.period), 'YYYY-MM-DD') AS period,
            a.cases AS a_cases, a.hours::text AS a_hours, a.rate AS a_rate, a.irr AS a_irr,
            b.cases AS b_cases, b.hours::text AS b_hours, b.rate AS b_rate, b.irr AS b_irr,
            (a.run_id IS NULL) AS added, (b.run_id IS NULL) AS removed,
            (a.cases IS DISTINCT FROM b.cases OR a.hours IS DISTINCT FROM b.hours OR a.rate IS DISTINCT FROM b.rate OR a.irr IS DISTINCT FROM b.irr) AS changed
     FROM a FULL JOIN b USING (outcome_id, exposure_group_id, window_kind, period)
     ORDER BY 1, 2, 3, 4`,
    [fromId, toId],
  );
  const side = (r: Row, p: 'a' | 'b') =>
    r[`${p}_cases`] === null ? null : { cases: r[`${p}_cases`], hours: r[`${p}_hours`], rate: n(r[`${p}_rate`]), irr: n(r[`${p}_irr`]) };
  const changed = rows.filter((r) => r.changed);
  return {
    from,
    to,
    settingsChanged: JSON.stringify(from.settings) !== JSON.stringify(to.settings) || from.codeVersion !== to.codeVersion,
    unchangedCount: rows.length - changed.length,
    rows: changed.map((r) => ({
      outcomeId: r.outcome_id,
      exposureGroupId: r.exposure_group_id,
      window: r.window_kind,
      period: r.period,
      change: r.added ? 'added' : r.removed ? 'removed' : 'changed',
      before: side(r, 'a'),
      after: side(r, 'b'),
    })),
  };
}

/** The run button: a request the worker picks up within seconds. */
export async function requestRun(ds: DataSource, principal: Principal, ip?: string): Promise<RunRequested> {
  return ds.transaction(async (em) => {
    const who = principal.kind === 'user' ? principal.email : `client:${principal.clientId}`;
    const [row]: Row[] = await em.query(`INSERT INTO run_requests (reason) VALUES ($1) RETURNING id::text AS id, requested_at`, [`run requested by ${who}`]);
    await recordAudit(em, { actor: principal, action: 'run.request', target: `run_request:${row!.id}`, ip });
    return { requestId: row!.id, requestedAt: iso(row!.requested_at)! };
  });
}

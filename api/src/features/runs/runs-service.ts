import type { DataSource } from 'typeorm';
import { toJsonValue } from '@ratewarden/shared/stats';
import type { Principal } from '@ratewarden/shared/permissions';
import type { RunDetail, RunDiff, RunRequested, RunResult, RunResultsQuery, RunSummary } from '@ratewarden/shared/runs';
import { recordAudit } from '../../audit/audit-log';
import { AppError } from '../../lib/app-error';
import type { Withheld } from '@ratewarden/shared/small-cells';
import { runFrame, seesEveryCount, withheldCount, withheldIn, type RunFrame } from '../../disclosure/run-frame';
import { unattributedFor } from './run-unattributed';
import { completenessOf, runPeriodBook, runWindowContext } from './run-periods';
import { isTwelveMonthWindow } from '@ratewarden/shared/windows';
import { resultScope } from '../../disclosure/result-scope';

export { resultScope };

type Row = Record<string, any>;

const runCols = `r.id, r.number, r.trigger, r.reason, r.state, r.started_at, r.finished_at, r.error, r.code_version,
  r.inputs, r.settings, r.settings_version, r.worker, r.summary, (cr.run_id IS NOT NULL) AS is_current`;
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
    settingsVersion: r.settings_version ?? null,
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
    unattributed: null,
    completeThrough: null,
  };
}

/**
 * A run's detail as its reader may see it: the summary's case totals (every case of an outcome,
 * attributed or not, company-wide) are sums over counts the disclosure frame withholds, and are
 * the physician's alone, as are the raw unattributed counts; the unattributed cases come counted
 * as the reader may see them (run-unattributed.ts).
 */
export async function runAsSeenBy(ds: DataSource, run: RunDetail, reader: ResultReader): Promise<RunDetail> {
  const unattributed = await unattributedFor(ds, run, reader);
  if (seesEveryCount(reader.principal) || !run.summary || typeof run.summary !== 'object') return { ...run, unattributed };
  const { cases: _cases, unattributed: _unattributed, ...summary } = run.summary as Record<string, unknown>;
  return { ...run, summary, unattributed };
}

/** The summary fields of a run's detail only (its `summary` holds figures a reader may not see). */
function summaryPart(d: RunDetail): RunSummary {
  const { id, number, trigger, reason, state, isCurrent, startedAt, finishedAt, error, codeVersion, settingsVersion, resultCount } = d;
  return { id, number, trigger, reason, state, isCurrent, startedAt, finishedAt, error, codeVersion, settingsVersion, resultCount };
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

export const n = (v: unknown) => toJsonValue(v) as number | 'Infinity' | '-Infinity' | null;
const limits = (r: Row, p: string) => ({ estimate: n(r[p]), lower: n(r[`${p}_lower`]), upper: n(r[`${p}_upper`]) });

/** Who reads results and how: their scope and whether small counts are shown. */
export interface ResultReader {
  principal: Principal;
  smallCellThreshold: number;
}

const nullLimits = () => ({ estimate: null, lower: null, upper: null });

/** withheldCount for a row's count, which may be missing (no row: nothing to withhold). */
function withheldOf(
  frame: RunFrame | null,
  cases: number | null,
  siteId: number | null,
  outcomeId: number,
  groupId: number,
  window: string,
  period: string,
  threshold: number,
): Withheld | null {
  return cases === null ? null : withheldCount(frame, cases, threshold, siteId, outcomeId, groupId, window, period);
}

/** "outcome|group|window|period" of every site count the frame withholds (a by-site adjustment is shown only without any). */
function siteCountsWithheld(frame: RunFrame | null): Set<string> {
  const out = new Set<string>();
  for (const key of frame?.keys() ?? []) {
    const [site, ...rest] = key.split('|');
    if (site !== 'all') out.add(rest.join('|'));
  }
  return out;
}

const MH_DETAIL = {
  age: ['mhAgeHomogeneity', 'mhAgeStrataUsed'],
  site: ['mhSiteHomogeneity', 'mhSiteStrataUsed'],
  sex: ['mhSexHomogeneity', 'mhSexStrataUsed'],
} as const;

/**
 * A result row as its reader may see it. A withheld count goes with every figure that would give
 * it back (rate and limits, u-chart, comparisons; a withheld reference count takes the
 * comparisons and the expected count). An adjusted measure is a function of its strata, so it is
 * shown only where they are: by age band and by sex where the company's stratum tables of both
 * groups are shown (run-strata.ts: twelve-month windows ending in December), by site where every site's count of both groups is.
 */
function resultOf(r: Row, reader: ResultReader, frame: RunFrame | null, sitesWithheld: Set<string>): Omit<RunResult, 'completeness'> {
  const t = reader.smallCellThreshold;
  const withheld = withheldOf(frame, r.cases, r.site_id, r.outcome_id, r.exposure_group_id, r.window_kind, r.period_iso, t);
  const suppressed = withheld !== null;
  const refId: number | null = r.reference_group_id === null || r.is_reference ? null : r.reference_group_id;
  const refWithheld = refId === null ? null : withheldOf(frame, r.ref_cases, r.site_id, r.outcome_id, refId, r.window_kind, r.period_iso, t);
  const comparisonSuppressed = !suppressed && refWithheld !== null;
  const hide = suppressed || comparisonSuppressed;
  const groups = refId === null ? [r.exposure_group_id] : [r.exposure_group_id, refId];
  const strataShown = (by: 'age' | 'sex') =>
    frame === null ||
    (r.site_id === null &&
      isTwelveMonthWindow(r.window_kind) &&
      groups.every((g) => withheldIn(frame, null, r.outcome_id, g, `strata_${by}`, r.period_iso) === null));
  const open = {
    age: !hide && strataShown('age'),
    sex: !hide && strataShown('sex'),
    site: !hide && (frame === null || (r.site_id === null && groups.every((g) => !sitesWithheld.has(`${r.outcome_id}|${g}|${r.window_kind}|${r.period_iso}`)))),
  };
  const mh = (by: 'age' | 'site' | 'sex') => {
    const p = `mh_${by}`;
    return open[by]
      ? { irr: { ...limits(r, `${p}_irr`), p: r[`${p}_irr_p`] }, ird: limits(r, `${p}_ird`) }
      : { irr: { ...nullLimits(), p: null }, ird: nullLimits() };
  };
  const detail = hide ? {} : (toJsonValue(r.detail) as Record<string, unknown>);
  for (const by of ['age', 'site', 'sex'] as const) if (!open[by]) for (const k of MH_DETAIL[by]) delete detail[k];
  return {
    siteId: r.site_id,
    outcomeId: r.outcome_id,
    exposureGroupId: r.exposure_group_id,
    window: r.window_kind,
    period: r.period_iso,
    monthsCovered: r.months_covered,
    isReference: r.is_reference,
    referenceGroupId: r.reference_group_id,
    cases: suppressed ? null : r.cases,
    suppressed,
    withheld,
    comparisonSuppressed,
    hours: r.hours,
    personTime: r.person_time,
    // The rate times the person-time gives the count back, and so do its exact limits.
    rate: suppressed ? nullLimits() : limits(r, 'rate'),
    // Expected cases come from the reference group's count: withheld with it, whether or not this row's count is.
    expected: refWithheld !== null ? null : r.expected,
    irr: hide
      ? { ...nullLimits(), p: null, waldLower: null, waldUpper: null }
      : { ...limits(r, 'irr'), p: r.irr_p, waldLower: n(r.irr_wald_lower), waldUpper: n(r.irr_wald_upper) },
    ird: hide ? { ...nullLimits(), p: null } : { ...limits(r, 'ird'), p: r.ird_p },
    mhAge: mh('age'),
    mhSite: mh('site'),
    mhSex: mh('sex'),
    uChart: suppressed ? { centre: null, lcl: null, ucl: null, signal: null } : { centre: r.u_centre, lcl: r.u_lcl, ucl: r.u_ucl, signal: r.u_signal },
    detail,
  };
}

/**
 * The results of one run, filtered; ordered by outcome, group, window and period. Company-wide
 * rows for readers of every site, one site's rows (computed by the run from that site's cells
 * alone) when `siteId` is given; small counts suppressed unless the reader is the physician.
 */
export async function listResults(ds: DataSource, runId: string, q: RunResultsQuery, reader: ResultReader): Promise<RunResult[]> {
  const run = await getRun(ds, runId); // a run's existence is not scoped (the run list shows every run)
  const siteId = await resultScope(ds, reader.principal, q.siteId);
  const frame = await runFrame(ds, runId, reader.principal, q.outcomeId);
  const rows: Row[] = await ds.query(
    `SELECT r.*, to_char(r.period, 'YYYY-MM-DD') AS period_iso, ref.cases AS ref_cases
     FROM run_results r
     LEFT JOIN run_results ref ON ref.run_id = r.run_id AND ref.site_id IS NOT DISTINCT FROM r.site_id AND ref.outcome_id = r.outcome_id
       AND ref.exposure_group_id = r.reference_group_id AND ref.window_kind = r.window_kind AND ref.period = r.period AND NOT r.is_reference
     WHERE r.run_id = $1 AND r.site_id IS NOT DISTINCT FROM $7::int AND ($2::int IS NULL OR r.outcome_id = $2) AND ($3::int IS NULL OR r.exposure_group_id = $3)
       AND ($4::text IS NULL OR r.window_kind = $4) AND ($5::date IS NULL OR r.period >= $5) AND ($6::date IS NULL OR r.period <= $6)
     ORDER BY r.outcome_id, r.exposure_group_id, r.window_kind, r.period`,
    [runId, q.outcomeId ?? null, q.exposureGroupId ?? null, q.window ?? null, q.from ?? null, q.to ?? null, siteId],
  );
  const sitesWithheld = siteCountsWithheld(frame);
  const completeness = completenessOf(await runPeriodBook(ds, runId), runWindowContext(run));
  return rows.map((r) => ({ ...resultOf(r, reader, frame, sitesWithheld), completeness: completeness(r.window_kind, r.period_iso, r.site_id) }));
}

/**
 * What changed between two runs: every result cell (outcome × group × window × period) added,
 * removed, or with different cases, hours, rate or IRR, in the reader's scope (as listResults).
 * Restated numbers are never overwritten, so both sides are read as they were stored. For readers
 * other than the physician the later run is the current one, its side withheld as in the results
 * (a count with its rate and IRR), and the earlier side's figures are withheld ('earlier').
 */
export async function diffRuns(ds: DataSource, fromId: string, toId: string, siteIdAsked: number | undefined, reader: ResultReader): Promise<RunDiff> {
  const [from, to] = [await getRun(ds, fromId), await getRun(ds, toId)];
  const siteId = await resultScope(ds, reader.principal, siteIdAsked);
  const rows: Row[] = await ds.query(
    `WITH scoped AS (
            SELECT r.*, ref.cases AS ref_cases
            FROM run_results r
            LEFT JOIN run_results ref ON ref.run_id = r.run_id AND ref.site_id IS NOT DISTINCT FROM r.site_id AND ref.outcome_id = r.outcome_id
              AND ref.exposure_group_id = r.reference_group_id AND ref.window_kind = r.window_kind AND ref.period = r.period AND NOT r.is_reference
            WHERE r.run_id IN ($1, $2) AND r.site_id IS NOT DISTINCT FROM $3::int),
          a AS (SELECT * FROM scoped WHERE run_id = $1),
          b AS (SELECT * FROM scoped WHERE run_id = $2)
     SELECT coalesce(a.outcome_id, b.outcome_id) AS outcome_id, coalesce(a.exposure_group_id, b.exposure_group_id) AS exposure_group_id,
            coalesce(a.window_kind, b.window_kind) AS window_kind, to_char(coalesce(a.period, b.period), 'YYYY-MM-DD') AS period,
            a.cases AS a_cases, a.hours::text AS a_hours, a.rate AS a_rate, a.irr AS a_irr, a.reference_group_id AS a_ref_group, a.ref_cases AS a_ref_cases,
            b.cases AS b_cases, b.hours::text AS b_hours, b.rate AS b_rate, b.irr AS b_irr, b.reference_group_id AS b_ref_group, b.ref_cases AS b_ref_cases,
            (a.run_id IS NULL) AS added, (b.run_id IS NULL) AS removed,
            (a.cases IS DISTINCT FROM b.cases OR a.hours IS DISTINCT FROM b.hours OR a.rate IS DISTINCT FROM b.rate OR a.irr IS DISTINCT FROM b.irr) AS changed
     FROM a FULL JOIN b USING (outcome_id, exposure_group_id, window_kind, period)
     ORDER BY 1, 2, 3, 4`,
    [fromId, toId, siteId],
  );
  // The reader's frame of the later run (which must be the current one for anyone but the
  // physician); the earlier run's figures are the physician's (see runFrame).
  const frame = await runFrame(ds, toId, reader.principal);
  const t = reader.smallCellThreshold;
  const side = (r: Row, p: 'a' | 'b') => {
    const cases = r[`${p}_cases`] as number | null;
    if (cases === null) return null;
    if (p === 'a' && frame !== null) return { cases: null, suppressed: true, withheld: 'earlier' as const, hours: r.a_hours, rate: null, irr: null };
    const withheld = withheldOf(frame, cases, siteId, r.outcome_id, r.exposure_group_id, r.window_kind, r.period, t);
    const refGroup = r[`${p}_ref_group`] as number | null;
    const refCases = r[`${p}_ref_cases`] as number | null;
    const refWithheld =
      refGroup !== null && refCases !== null && withheldOf(frame, refCases, siteId, r.outcome_id, refGroup, r.window_kind, r.period, t) !== null;
    // The IRR is withheld with the count: with the reference row it would give the count back; and
    // with the reference count: with the group's rate it would give that back.
    return withheld
      ? { cases: null, suppressed: true, withheld, hours: r[`${p}_hours`], rate: null, irr: null }
      : { cases, suppressed: false, withheld, hours: r[`${p}_hours`], rate: n(r[`${p}_rate`]), irr: refWithheld ? null : n(r[`${p}_irr`]) };
  };
  const changed = rows.filter((r) => r.changed);
  return {
    from: summaryPart(from),
    to: summaryPart(to),
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

/** The run button: a request the worker picks up within seconds (immediate: it does not wait for uploads to settle). */
export async function requestRun(ds: DataSource, principal: Principal, ip?: string): Promise<RunRequested> {
  return ds.transaction(async (em) => {
    const who = principal.kind === 'user' ? principal.email : `client:${principal.clientId}`;
    const [row]: Row[] = await em.query(`INSERT INTO run_requests (reason, immediate) VALUES ($1, true) RETURNING id::text AS id, requested_at`, [
      `run requested by ${who}`,
    ]);
    await recordAudit(em, { actor: principal, action: 'run.request', target: `run_request:${row!.id}`, ip });
    return { requestId: row!.id, requestedAt: iso(row!.requested_at)! };
  });
}

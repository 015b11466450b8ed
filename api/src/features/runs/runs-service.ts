import type { DataSource } from 'typeorm';
import { requestRun as requestRunOf } from '@ratewarden/db/run-requests';
import type { Principal } from '@ratewarden/shared/permissions';
import type { RunDetail, RunRequested, RunSummary } from '@ratewarden/shared/runs';
import { recordAudit } from '../../audit/audit-log';
import { seesEveryCount } from '../../disclosure/run-frame';
import { AppError } from '../../lib/app-error';
import type { ResultReader } from './result-reader';
import { unattributedFor } from './run-unattributed';

// Runs as records: the list, one run's detail as its reader may see it, and the run button.
// Their results: run-results.ts; the difference between two runs: run-diff.ts.

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
export function summaryPart(d: RunDetail): RunSummary {
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

/** The run button: a request the worker picks up within seconds (immediate: it does not wait for uploads to settle). */
export async function requestRun(ds: DataSource, principal: Principal, ip?: string): Promise<RunRequested> {
  return ds.transaction(async (em) => {
    const who = principal.kind === 'user' ? principal.email : `client:${principal.clientId}`;
    const made = await requestRunOf(em, `run requested by ${who}`, { immediate: true });
    await recordAudit(em, { actor: principal, action: 'run.request', target: `run_request:${made.id}`, ip });
    return { requestId: made.id, requestedAt: iso(made.requestedAt)! };
  });
}

import type { DataSource } from 'typeorm';
import { CurrentRunEntity } from '@ratewarden/db/entities/current-run';
import { RunEntity, type Run } from '@ratewarden/db/entities/run';
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

/** A run with whether it is the current one (current_run points at it). */
type RunRecord = Run & { isCurrent: boolean };

const iso = (d: Date | string | null): string | null => (d === null ? null : new Date(d).toISOString());

function summaryOf(r: RunRecord): RunSummary {
  return {
    id: r.id,
    number: Number(r.number),
    trigger: r.trigger,
    reason: r.reason,
    state: r.state,
    isCurrent: r.isCurrent,
    startedAt: iso(r.startedAt)!,
    finishedAt: iso(r.finishedAt),
    error: r.error,
    codeVersion: r.codeVersion,
    settingsVersion: r.settingsVersion ?? null,
    resultCount: typeof r.summary?.results === 'number' ? r.summary.results : null,
  };
}

function detailOf(r: RunRecord): RunDetail {
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

/** Runs read with the current-run pointer beside them (one statement), `where` applied to the run `r`. */
async function readRuns(ds: DataSource, filter: { id?: string; current?: true; limit?: number }): Promise<RunRecord[]> {
  const qb = ds.getRepository(RunEntity).createQueryBuilder('r').addSelect('cr.runId', 'current_run_id');
  if (filter.current) qb.innerJoin(CurrentRunEntity.options.name, 'cr', 'cr.runId = r.id');
  else qb.leftJoin(CurrentRunEntity.options.name, 'cr', 'cr.runId = r.id');
  if (filter.id !== undefined) qb.where('r.id = :id', { id: filter.id });
  if (filter.limit !== undefined) qb.orderBy('r.number', 'DESC').limit(filter.limit);
  const { entities, raw } = await qb.getRawAndEntities<{ current_run_id: string | null }>();
  const current = new Set(raw.flatMap((r) => (r.current_run_id ? [r.current_run_id] : [])));
  return entities.map((r) => ({ ...r, isCurrent: current.has(r.id) }));
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
  return (await readRuns(ds, { limit })).map(summaryOf);
}

export async function getRun(ds: DataSource, id: string | 'current'): Promise<RunDetail> {
  const [run] = await readRuns(ds, id === 'current' ? { current: true } : { id });
  if (!run) throw new AppError('not_found', id === 'current' ? 'no run has succeeded yet' : 'no such run');
  return detailOf(run);
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

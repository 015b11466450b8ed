import { In, type DataSource } from 'typeorm';
import { RunPeriodEntity } from '@ratewarden/db/entities/run-period';
import { SiteEntity } from '@ratewarden/db/entities/site';
import { pendingRun } from '@ratewarden/db/run-requests';
import type { Principal } from '@ratewarden/shared/permissions';
import type { PendingRunAnswer, RunDetail } from '@ratewarden/shared/runs';
import { PeriodBook, type CompleteThrough, type Completeness } from '@ratewarden/shared/periods';
import { windowContextOf, type WindowContext, type WindowKind } from '@ratewarden/shared/windows';
import { siteScope } from '../../auth/authorize';
import { readsEverySite } from '../../disclosure/run-frame';
import { RunMemo } from '../../lib/run-memo';

/**
 * The reporting periods as a run saw them (run_periods), not as they stand today: a result says
 * whether its period was complete when it was computed. A run stored before periods were
 * recorded has none, and all its periods read as partial (not known to be complete).
 */
export function runPeriodBook(ds: DataSource, runId: string): Promise<PeriodBook> {
  return books.get(runId, async () => {
    const periods = await ds.getRepository(RunPeriodEntity).find({ where: { runId } });
    return new PeriodBook(periods.map((r) => ({ siteId: r.siteId, month: r.month, state: r.state, roster: r.roster, retired: r.retired })));
  });
}

/** A run's period states never change: kept for the runs read last. */
const books = new RunMemo<PeriodBook>(16);

/**
 * Completeness of a result row (company-wide when `siteId` is null), remembered per window ×
 * period × scope; `ctx` is the run's (its whole-period start).
 */
export function completenessOf(book: PeriodBook, ctx: WindowContext): (window: WindowKind, period: string, siteId: number | null) => Completeness {
  const seen = new Map<string, Completeness>();
  return (window, period, siteId) => {
    const key = `${window}|${period}|${siteId ?? 'all'}`;
    let c = seen.get(key);
    if (c === undefined) {
      c = book.completeness(window, period, siteId === null ? null : [siteId], ctx);
      seen.set(key, c);
    }
    return c;
  };
}

/** The window context (whole-period start) of a run's settings. */
export const runWindowContext = (run: Pick<RunDetail, 'settings'>): WindowContext => windowContextOf(run.settings);

/**
 * The latest complete month of a run, company-wide (for readers of every site, who read the
 * company's figures) and for each of the reader's sites.
 */
export async function completeThroughFor(ds: DataSource, runId: string, principal: Principal): Promise<CompleteThrough> {
  const book = await runPeriodBook(ds, runId);
  const scope = siteScope(principal);
  const sites = await ds.getRepository(SiteEntity).find({ select: { id: true }, where: scope === 'all' ? {} : { id: In(scope) }, order: { id: 'ASC' } });
  return {
    company: (await readsEverySite(ds, principal)) ? book.latestComplete() : null,
    sites: sites.map((s) => ({ siteId: s.id, month: book.latestComplete([s.id]) })),
  };
}

/** A run's detail with its latest complete months in the reader's scope. */
export async function withCompleteThrough(ds: DataSource, run: RunDetail, principal: Principal): Promise<RunDetail> {
  return { ...run, completeThrough: await completeThroughFor(ds, run.id, principal) };
}

/** The pending run requests and when the worker runs them (db/src/run-requests.ts states the rule). */
export async function pendingRunOf(ds: DataSource, quietSeconds: number): Promise<PendingRunAnswer> {
  const p = await pendingRun(ds, quietSeconds);
  return { pending: p ? { count: p.count, immediate: p.immediate, latestAt: p.latestAt.toISOString(), dueAt: p.dueAt.toISOString() } : null };
}

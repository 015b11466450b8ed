import { Router, type Request } from 'express';
import type { DataSource } from 'typeorm';
import { z } from 'zod';
import { runDiffQuerySchema, runPeriodIndexQuerySchema, runResultsQuerySchema, runStrataQuerySchema } from '@ratewarden/shared/runs';
import { authorize } from '../../auth/authorize';
import { versionsOf } from '../../lib/data-versions';
import { TaggedAnswers } from '../../lib/tagged-answers';
import { RunAnswers } from './run-cache';
import { runPeriodIndex } from './run-period-index';
import { runStrata } from './run-strata';
import { listUnattributed } from './run-unattributed';
import { pendingRunOf, withCompleteThrough } from './run-periods';
import { diffRuns } from './run-diff';
import { listResults } from './run-results';
import { getRun, listRuns, requestRun, runAsSeenBy } from './runs-service';

export interface RunsRouterDeps {
  dataSource: DataSource;
  /** Case counts below this are suppressed for every role but the physician (SMALL_CELL_THRESHOLD). */
  smallCellThreshold: number;
  /** RUN_QUIET_SECONDS: how long the worker lets uploads settle before an intake's run (to say when it comes). */
  runQuietSeconds: number;
  /** RUN_ANSWER_CACHE_MB: memory for run answers kept ready to send, in bytes. */
  answerCacheBytes: number;
}

const runId = z.string().uuid();

/** Runs: history, one run, its results, the difference between two, and the run button; mounted at /api/runs. */
export function runsRouter({ dataSource: ds, smallCellThreshold, runQuietSeconds, answerCacheBytes }: RunsRouterDeps): Router {
  const reader = (req: Request) => ({ principal: req.principal!, smallCellThreshold });
  const answers = new RunAnswers(ds, smallCellThreshold, answerCacheBytes);
  const router = Router();
  // The history, kept per reader and `runs` counter (lib/tagged-answers.ts).
  const history = new TaggedAnswers('runs', 4 * 1024 ** 2);
  router.get('/', authorize('runs:read'), async (req, res) => {
    const { runs } = await versionsOf(ds, req);
    await history.send(req, res, [runs], () => listRuns(ds));
  });
  router.post('/', authorize('runs:trigger'), async (req, res) => {
    res.status(202).json(await requestRun(ds, req.principal!, req.ip));
  });
  // Whether a run is waiting for uploads to settle, and until when: kept under the same counter (run_requests raise it).
  const pending = new TaggedAnswers('pending', 1024 ** 2);
  router.get('/pending', authorize('runs:read'), async (req, res) => {
    const { runs } = await versionsOf(ds, req);
    await pending.send(req, res, [runs, runQuietSeconds], () => pendingRunOf(ds, runQuietSeconds));
  });
  // Same scope and suppression as the results below.
  router.get('/diff', authorize('runs:read'), async (req, res) => {
    await answers.send(req, res, async () => {
      const q = runDiffQuerySchema.parse(req.query);
      return await diffRuns(ds, q.from, q.to, q.siteId, reader(req));
    });
  });
  router.get('/current', authorize('runs:read'), async (req, res) => {
    await answers.send(req, res, async () => await withCompleteThrough(ds, await runAsSeenBy(ds, await getRun(ds, 'current'), reader(req)), req.principal!));
  });
  // Case-level: the current run's unattributed cases one by one (the counts are in the run's detail).
  router.get('/current/unattributed', authorize('cases:read'), async (req, res) => {
    res.json(await listUnattributed(ds, req.principal!, req.ip));
  });
  router.get('/:id', authorize('runs:read'), async (req, res) => {
    await answers.send(
      req,
      res,
      async () => await withCompleteThrough(ds, await runAsSeenBy(ds, await getRun(ds, runId.parse(req.params.id)), reader(req)), req.principal!),
    );
  });
  /**
   * Results of a run. Site scoping: a run stores company-wide rows and, for every site, rows
   * computed from that site's cells alone. Without `siteId` the company-wide rows are served to
   * readers of every site; a reader assigned only some sites gets 403 (the company figures
   * include workers of sites they may not see) and asks for each of their sites with
   * `?siteId=`; a site outside their assignment is 403 too. Small-cell suppression: counts from
   * 1 to SMALL_CELL_THRESHOLD − 1 (default 5) are null with `suppressed: true`, with every figure
   * that would reveal them, for every role but the physician (see runResultSchema).
   */
  router.get('/:id/results', authorize('aggregates:read'), async (req, res) => {
    await answers.send(req, res, async () => await listResults(ds, runId.parse(req.params.id), runResultsQuerySchema.parse(req.query), reader(req)));
  });
  /** The periods of one outcome's window with completeness and what the reader sees of them (same scope and frame as the results). */
  router.get('/:id/periods', authorize('aggregates:read'), async (req, res) => {
    await answers.send(req, res, async () => await runPeriodIndex(ds, runId.parse(req.params.id), runPeriodIndexQuerySchema.parse(req.query), reader(req)));
  });
  /**
   * The stratum table behind an adjusted figure: one group and its reference group per age band,
   * site or sex, from the cells the run aggregated, with each stratum's IRR and IRD; same scope
   * and suppression as the results (a stratum's count is withheld when small, or when it would
   * give a small one back by subtraction from the group's count).
   */
  router.get('/:id/strata', authorize('aggregates:read'), async (req, res) => {
    await answers.send(req, res, async () => await runStrata(ds, runId.parse(req.params.id), runStrataQuerySchema.parse(req.query), reader(req)));
  });
  return router;
}

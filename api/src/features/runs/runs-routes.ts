import { Router } from 'express';
import type { DataSource } from 'typeorm';
import { z } from 'zod';
import { runDiffQuerySchema, runResultsQuerySchema } from '@ratewarden/shared/runs';
import { authorize } from '../../auth/authorize';
import { diffRuns, getRun, listResults, listRuns, requestRun } from './runs-service';

export interface RunsRouterDeps {
  dataSource: DataSource;
}

const runId = z.string().uuid();

/** Runs: history, one run, its results, the difference between two, and the run button; mounted at /api/runs. */
export function runsRouter({ dataSource: ds }: RunsRouterDeps): Router {
  const router = Router();
  router.get('/', authorize('runs:read'), async (_req, res) => {
    res.json(await listRuns(ds));
  });
  router.post('/', authorize('runs:trigger'), async (req, res) => {
    res.status(202).json(await requestRun(ds, req.principal!, req.ip));
  });
  router.get('/diff', authorize('runs:read'), async (req, res) => {
    const q = runDiffQuerySchema.parse(req.query);
    res.json(await diffRuns(ds, q.from, q.to));
  });
  router.get('/current', authorize('runs:read'), async (_req, res) => {
    res.json(await getRun(ds, 'current'));
  });
  router.get('/:id', authorize('runs:read'), async (req, res) => {
    res.json(await getRun(ds, runId.parse(req.params.id)));
  });
  router.get('/:id/results', authorize('aggregates:read'), async (req, res) => {
    res.json(await listResults(ds, runId.parse(req.params.id), runResultsQuerySchema.parse(req.query)));
  });
  return router;
}

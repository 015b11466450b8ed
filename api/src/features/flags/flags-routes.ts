import { Router } from 'express';
import type { DataSource } from 'typeorm';
import { z } from 'zod';
import { flagCloseInputSchema, flagListQuerySchema, flagReviewInputSchema } from '@ratewarden/shared/flags';
import { authorize } from '../../auth/authorize';
import { closeFlag, flagCases, getFlag, listFlags, startReview } from './flags-service';

export interface FlagsRouterDeps {
  dataSource: DataSource;
}

const flagId = z.string().uuid();

/** Flags, their review and closing, and (physician only) the cases behind one; mounted at /api/flags. */
export function flagsRouter({ dataSource: ds }: FlagsRouterDeps): Router {
  const router = Router();
  router.get('/', authorize('flags:read'), async (req, res) => {
    res.json(await listFlags(ds, flagListQuerySchema.parse(req.query)));
  });
  router.get('/:id', authorize('flags:read'), async (req, res) => {
    res.json(await getFlag(ds, flagId.parse(req.params.id)));
  });
  router.post('/:id/review', authorize('flags:review'), async (req, res) => {
    res.json(await startReview(ds, req.principal!, flagId.parse(req.params.id), flagReviewInputSchema.parse(req.body ?? {}).comment, req.ip));
  });
  router.post('/:id/close', authorize('flags:review'), async (req, res) => {
    res.json(await closeFlag(ds, req.principal!, flagId.parse(req.params.id), flagCloseInputSchema.parse(req.body), req.ip));
  });
  router.get('/:id/cases', authorize('cases:read'), async (req, res) => {
    res.json(await flagCases(ds, req.principal!, flagId.parse(req.params.id), req.ip));
  });
  return router;
}

import { Router } from 'express';
import type { DataSource } from 'typeorm';
import { z } from 'zod';
import { caseConflictInputSchema, caseListQuerySchema, caseReviewInputSchema } from '@ratewarden/shared/cases';
import { authorize } from '../../auth/authorize';
import { listConflicts, resolveConflict } from './case-conflicts-service';
import { exportCases, getCase, listCases, reviewCase } from './cases-service';

const caseRef = z.string().trim().min(1).max(200);
const intakeId = z.string().uuid();

/**
 * The physician's case register and case review, mounted at /api/cases: case-level data, so every
 * route needs `cases:*` (the physician's alone), is site-scoped, and every read is audited.
 */
export function casesRouter({ dataSource: ds }: { dataSource: DataSource }): Router {
  const router = Router();
  router.get('/', authorize('cases:read'), async (req, res) => {
    res.json(await listCases(ds, req.principal!, caseListQuerySchema.parse(req.query), req.ip));
  });
  router.get('/export', authorize('cases:read'), async (req, res) => {
    res.json(await exportCases(ds, req.principal!, caseListQuerySchema.parse(req.query), req.ip));
  });
  router.get('/:caseRef', authorize('cases:read'), async (req, res) => {
    res.json(await getCase(ds, req.principal!, caseRef.parse(req.params.caseRef), req.ip));
  });
  router.post('/:caseRef/review', authorize('cases:review'), async (req, res) => {
    res.json(await reviewCase(ds, req.principal!, caseRef.parse(req.params.caseRef), caseReviewInputSchema.parse(req.body ?? {}), req.ip));
  });
  // A case list's cases that contradict a physician's decision, and the physician's resolution of each.
  router.get('/conflicts/:intakeId', authorize('cases:read'), async (req, res) => {
    res.json(await listConflicts(ds, req.principal!, intakeId.parse(req.params.intakeId), req.ip));
  });
  router.post('/conflicts/:intakeId/:caseRef', authorize('cases:review'), async (req, res) => {
    const body = caseConflictInputSchema.parse(req.body ?? {});
    res.json(await resolveConflict(ds, req.principal!, intakeId.parse(req.params.intakeId), caseRef.parse(req.params.caseRef), body.resolution, req.ip));
  });
  return router;
}

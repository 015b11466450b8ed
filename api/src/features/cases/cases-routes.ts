import { Router } from 'express';
import type { DataSource } from 'typeorm';
import { z } from 'zod';
import { caseListQuerySchema, caseReviewInputSchema } from '@ratewarden/shared/cases';
import { authorize } from '../../auth/authorize';
import { exportCases, getCase, listCases, reviewCase } from './cases-service';

const caseRef = z.string().trim().min(1).max(200);

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
  return router;
}

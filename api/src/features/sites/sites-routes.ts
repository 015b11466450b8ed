import { Router } from 'express';
import type { DataSource } from 'typeorm';
import { z } from 'zod';
import { siteCreateSchema, siteUpdateSchema } from '@ratewarden/shared/groups';
import { authorize } from '../../auth/authorize';
import { createSite, listSites, setSiteRetired, updateSite } from './sites-service';

export interface SitesRouterDeps {
  dataSource: DataSource;
}

const idParam = z.coerce.number().int().positive();

/** Sites, mounted at /api/sites: everyone with configuration access reads them; the administrator manages them. */
export function sitesRouter({ dataSource: ds }: SitesRouterDeps): Router {
  const router = Router();
  router.get('/', authorize('config:read'), async (_req, res) => {
    res.json(await listSites(ds));
  });
  router.post('/', authorize('sites:manage'), async (req, res) => {
    res.status(201).json(await createSite(ds, req.principal!, siteCreateSchema.parse(req.body), req.ip));
  });
  router.patch('/:id', authorize('sites:manage'), async (req, res) => {
    res.json(await updateSite(ds, req.principal!, idParam.parse(req.params.id), siteUpdateSchema.parse(req.body), req.ip));
  });
  router.post('/:id/retire', authorize('sites:manage'), async (req, res) => {
    res.json(await setSiteRetired(ds, req.principal!, idParam.parse(req.params.id), true, req.ip));
  });
  router.post('/:id/reinstate', authorize('sites:manage'), async (req, res) => {
    res.json(await setSiteRetired(ds, req.principal!, idParam.parse(req.params.id), false, req.ip));
  });
  return router;
}

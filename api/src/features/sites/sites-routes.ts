import { Router } from 'express';
import type { DataSource } from 'typeorm';
import { z } from 'zod';
import { siteCreateSchema, siteUpdateSchema } from '@ratewarden/shared/groups';
import { authorize } from '../../auth/authorize';
import { versionsOf } from '../../lib/data-versions';
import { TaggedAnswers } from '../../lib/tagged-answers';
import { createSite, listSites, setSiteRetired, updateSite } from './sites-service';

export interface SitesRouterDeps {
  dataSource: DataSource;
}

const idParam = z.coerce.number().int().positive();

/** Sites, mounted at /api/sites: everyone with configuration access reads them; the administrator manages them. */
export function sitesRouter({ dataSource: ds }: SitesRouterDeps): Router {
  const router = Router();
  // Kept per reader and `config` counter (lib/tagged-answers.ts): a change anywhere shows at once.
  const lists = new TaggedAnswers('sites', 2 * 1024 ** 2);
  router.get('/', authorize('config:read'), async (req, res) => {
    const { config } = await versionsOf(ds, req);
    await lists.send(req, res, [config], () => listSites(ds));
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

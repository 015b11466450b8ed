import { Router, type Request, type Response } from 'express';
import type { DataSource } from 'typeorm';
import { z } from 'zod';
import {
  exposureGroupCreateSchema,
  exposureGroupUpdateSchema,
  exposureLevelsSchema,
  outcomeCreateSchema,
  outcomeUpdateSchema,
} from '@ratewarden/shared/groups';
import { authorize } from '../../auth/authorize';
import { versionsOf } from '../../lib/data-versions';
import { TaggedAnswers } from '../../lib/tagged-answers';
import {
  configHistory,
  createGroup,
  createOutcome,
  listGroups,
  listOutcomes,
  setExposureLevels,
  setReferenceGroup,
  updateGroup,
  updateOutcome,
} from './groups-service';

export interface GroupsRouterDeps {
  dataSource: DataSource;
}

const idParam = z.coerce.number().int().positive();

/** Exposure groups and outcomes (the hygienist edits them); mounted at /api. */
export function groupsRouter({ dataSource: ds }: GroupsRouterDeps): Router {
  const router = Router();
  // Kept per reader and `config` counter (lib/tagged-answers.ts): a change anywhere shows at once.
  const lists = new TaggedAnswers('config', 4 * 1024 ** 2);
  const list = (read: () => Promise<unknown>) => async (req: Request, res: Response) => {
    const { config } = await versionsOf(ds, req);
    await lists.send(req, res, [config], read);
  };
  router.get(
    '/groups',
    authorize('config:read'),
    list(() => listGroups(ds)),
  );
  router.post('/groups', authorize('groups:write'), async (req, res) => {
    res.status(201).json(await createGroup(ds, req.principal!, exposureGroupCreateSchema.parse(req.body), req.ip));
  });
  router.put('/groups/levels', authorize('groups:write'), async (req, res) => {
    res.json(await setExposureLevels(ds, req.principal!, exposureLevelsSchema.parse(req.body).levels, req.ip));
  });
  router.patch('/groups/:id', authorize('groups:write'), async (req, res) => {
    res.json(await updateGroup(ds, req.principal!, idParam.parse(req.params.id), exposureGroupUpdateSchema.parse(req.body), req.ip));
  });
  router.post('/groups/:id/reference', authorize('groups:write'), async (req, res) => {
    res.json(await setReferenceGroup(ds, req.principal!, idParam.parse(req.params.id), req.ip));
  });
  router.get('/groups/:id/history', authorize('config:read'), async (req, res) => {
    res.json(await configHistory(ds, 'exposure_group', idParam.parse(req.params.id)));
  });

  router.get(
    '/outcomes',
    authorize('config:read'),
    list(() => listOutcomes(ds)),
  );
  router.post('/outcomes', authorize('groups:write'), async (req, res) => {
    res.status(201).json(await createOutcome(ds, req.principal!, outcomeCreateSchema.parse(req.body), req.ip));
  });
  router.patch('/outcomes/:id', authorize('groups:write'), async (req, res) => {
    res.json(await updateOutcome(ds, req.principal!, idParam.parse(req.params.id), outcomeUpdateSchema.parse(req.body), req.ip));
  });
  router.get('/outcomes/:id/history', authorize('config:read'), async (req, res) => {
    res.json(await configHistory(ds, 'outcome', idParam.parse(req.params.id)));
  });
  return router;
}

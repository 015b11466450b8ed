import { Router } from 'express';
import type { DataSource } from 'typeorm';
import { z } from 'zod';
import { watchRuleSchemas } from '@ratewarden/shared/rules';
import { authorize } from '../../auth/authorize';
import { createRule, deleteRule, getRule, listRules, updateRule } from './rules-service';

export interface RulesRouterDeps {
  dataSource: DataSource;
  /** SMALL_CELL_THRESHOLD: rules may not select groups on fewer cases than this. */
  smallCellThreshold: number;
}

const ruleId = z.string().uuid();

/** Watch rules (the safety manager and hygienist edit them); mounted at /api/rules. */
export function rulesRouter({ dataSource: ds, smallCellThreshold }: RulesRouterDeps): Router {
  const router = Router();
  const bodies = watchRuleSchemas(smallCellThreshold);
  router.get('/', authorize('rules:read'), async (_req, res) => {
    res.json(await listRules(ds));
  });
  router.get('/:id', authorize('rules:read'), async (req, res) => {
    res.json(await getRule(ds, ruleId.parse(req.params.id)));
  });
  router.post('/', authorize('rules:write'), async (req, res) => {
    res.status(201).json(await createRule(ds, req.principal!, bodies.input.parse(req.body), { ip: req.ip, smallCellThreshold }));
  });
  router.patch('/:id', authorize('rules:write'), async (req, res) => {
    res.json(await updateRule(ds, req.principal!, ruleId.parse(req.params.id), bodies.patch.parse(req.body), { ip: req.ip, smallCellThreshold }));
  });
  router.delete('/:id', authorize('rules:write'), async (req, res) => {
    await deleteRule(ds, req.principal!, ruleId.parse(req.params.id), req.ip);
    res.status(204).end();
  });
  return router;
}

import { Router } from 'express';
import type { DataSource } from 'typeorm';
import { z } from 'zod';
import { watchRuleInputSchema, watchRulePatchSchema } from '@ratewarden/shared/rules';
import { authorize } from '../../auth/authorize';
import { createRule, deleteRule, getRule, listRules, updateRule } from './rules-service';

export interface RulesRouterDeps {
  dataSource: DataSource;
}

const ruleId = z.string().uuid();

/** Watch rules (the safety manager and hygienist edit them); mounted at /api/rules. */
export function rulesRouter({ dataSource: ds }: RulesRouterDeps): Router {
  const router = Router();
  router.get('/', authorize('rules:read'), async (_req, res) => {
    res.json(await listRules(ds));
  });
  router.get('/:id', authorize('rules:read'), async (req, res) => {
    res.json(await getRule(ds, ruleId.parse(req.params.id)));
  });
  router.post('/', authorize('rules:write'), async (req, res) => {
    res.status(201).json(await createRule(ds, req.principal!, watchRuleInputSchema.parse(req.body), req.ip));
  });
  router.patch('/:id', authorize('rules:write'), async (req, res) => {
    res.json(await updateRule(ds, req.principal!, ruleId.parse(req.params.id), watchRulePatchSchema.parse(req.body), req.ip));
  });
  router.delete('/:id', authorize('rules:write'), async (req, res) => {
    await deleteRule(ds, req.principal!, ruleId.parse(req.params.id), req.ip);
    res.status(204).end();
  });
  return router;
}

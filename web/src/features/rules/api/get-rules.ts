import { watchRuleSchema, type WatchRule } from '@ratewarden/shared/rules';
import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../../lib/api-client';
import { ruleKeys } from './rule-keys';

export function getRules(signal?: AbortSignal): Promise<WatchRule[]> {
  return api.get('/api/rules', z.array(watchRuleSchema), signal);
}

export const rulesQueryOptions = () => queryOptions({ queryKey: ruleKeys.list(), queryFn: ({ signal }) => getRules(signal) });

export function useRules() {
  return useSuspenseQuery(rulesQueryOptions());
}

import { watchRuleSchema, type WatchRule } from '@ratewarden/shared/rules';
import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { ruleKeys } from './rule-keys';

export function getRule(id: string, signal?: AbortSignal): Promise<WatchRule> {
  return api.get(`/api/rules/${encodeURIComponent(id)}`, watchRuleSchema, signal);
}

export const ruleQueryOptions = (id: string) => queryOptions({ queryKey: ruleKeys.detail(id), queryFn: ({ signal }) => getRule(id, signal) });

export function useRule(id: string) {
  return useSuspenseQuery(ruleQueryOptions(id));
}

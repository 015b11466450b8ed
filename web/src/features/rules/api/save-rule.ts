import { watchRuleSchema, type WatchRuleInput } from '@ratewarden/shared/rules';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../../lib/api-client';
import { ruleKeys } from './rule-keys';

export function saveRule({ id, body }: { id: string | null; body: WatchRuleInput }) {
  return id === null ? api.post('/api/rules', watchRuleSchema, body) : api.patch(`/api/rules/${encodeURIComponent(id)}`, watchRuleSchema, body);
}

export function deleteRule(id: string) {
  return api.delete(`/api/rules/${encodeURIComponent(id)}`, z.undefined());
}

export function useSaveRule() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: saveRule, onSuccess: () => qc.invalidateQueries({ queryKey: ruleKeys.all }) });
}

export function useDeleteRule() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: deleteRule, onSuccess: () => qc.invalidateQueries({ queryKey: ruleKeys.all }) });
}

import { watchRuleSchema, type WatchRule, type WatchRuleInput } from '@ratewarden/shared/rules';
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

/**
 * Saves a rule; the saved rule goes straight into the cached list and detail (the list page is
 * not mounted while the editor is, so a plain invalidation would show the old list for a moment
 * after saving), then both are refetched in the background.
 */
export function useSaveRule() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: saveRule,
    onSuccess: (rule: WatchRule) => {
      qc.setQueryData(ruleKeys.detail(rule.id), rule);
      qc.setQueryData<WatchRule[]>(ruleKeys.list(), (list) =>
        list ? (list.some((r) => r.id === rule.id) ? list.map((r) => (r.id === rule.id ? rule : r)) : [...list, rule]) : list,
      );
      void qc.invalidateQueries({ queryKey: ruleKeys.all });
    },
  });
}

export function useDeleteRule() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: deleteRule, onSuccess: () => qc.invalidateQueries({ queryKey: ruleKeys.all }) });
}

import { outcomeSchema, type OutcomeCreate, type OutcomeUpdate } from '@ratewarden/shared/groups';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { configKeys } from '../../../api/config-keys';

export type OutcomeSave = { id: null; body: OutcomeCreate } | { id: number; body: OutcomeUpdate };

export function saveOutcome(s: OutcomeSave) {
  return s.id === null ? api.post('/api/outcomes', outcomeSchema, s.body) : api.patch(`/api/outcomes/${s.id}`, outcomeSchema, s.body);
}

export function useSaveOutcome() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: saveOutcome, onSuccess: () => qc.invalidateQueries({ queryKey: configKeys.all }) });
}

import { intakeDetailSchema } from '@ratewarden/shared/intake-schemas';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { intakeKeys } from './intake-keys';

/** Apply or discard a checked intake (or restore a superseded one); every intake query is stale after. */
export type IntakeDecision = 'apply' | 'discard' | 'restore';

export function decideIntake(id: string, decision: IntakeDecision) {
  return api.post(`/api/intakes/${encodeURIComponent(id)}/${decision}`, intakeDetailSchema);
}

export function useDecideIntake(id: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (decision: IntakeDecision) => decideIntake(id, decision),
    onSuccess: (intake) => {
      qc.setQueryData(intakeKeys.detail(id), intake);
      return qc.invalidateQueries({ queryKey: intakeKeys.all });
    },
  });
}

import { flagDetailSchema, type FlagCloseInput } from '@ratewarden/shared/flags';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { flagKeys } from '../../../api/flag-keys';

export type FlagDecision = { kind: 'review'; comment?: string } | ({ kind: 'close' } & FlagCloseInput);

export function decideFlag(id: string, d: FlagDecision) {
  const path = `/api/flags/${encodeURIComponent(id)}/${d.kind}`;
  return d.kind === 'review'
    ? api.post(path, flagDetailSchema, d.comment ? { comment: d.comment } : {})
    : api.post(path, flagDetailSchema, { reason: d.reason, comment: d.comment });
}

/** Start the review or close the flag; the detail is replaced and every flag list refetched. */
export function useDecideFlag(id: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (d: FlagDecision) => decideFlag(id, d),
    onSuccess: (flag) => {
      qc.setQueryData(flagKeys.detail(id), flag);
      return qc.invalidateQueries({ queryKey: flagKeys.lists() });
    },
  });
}

import { caseReviewResultSchema, type CaseReviewInput } from '@ratewarden/shared/cases';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { caseKeys } from './case-keys';

export function reviewCase(ref: string, input: CaseReviewInput) {
  return api.post(`/api/cases/${encodeURIComponent(ref)}/review`, caseReviewResultSchema, input);
}

/** Confirm, rule out or reopen a case: the detail is replaced and the register refetched. */
export function useReviewCase(ref: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: CaseReviewInput) => reviewCase(ref, input),
    onSuccess: (result) => {
      qc.setQueryData(caseKeys.detail(ref), result.case);
      return qc.invalidateQueries({ queryKey: caseKeys.lists() });
    },
  });
}

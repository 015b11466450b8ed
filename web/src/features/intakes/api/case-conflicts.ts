import { caseConflictSchema, type CaseConflict, type CaseConflictResolution } from '@ratewarden/shared/cases';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../../lib/api-client';
import { intakeKeys } from './intake-keys';

const conflictsKey = (id: string) => [...intakeKeys.detail(id), 'conflicts'] as const;

/** A case list's cases that contradict a physician's decision: the server answers only the physician, and records the read. */
export function useCaseConflicts(intakeId: string) {
  return useQuery({
    queryKey: conflictsKey(intakeId),
    queryFn: ({ signal }) => api.get(`/api/cases/conflicts/${encodeURIComponent(intakeId)}`, z.array(caseConflictSchema), signal),
  });
}

export function useResolveConflict(intakeId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ caseRef, resolution }: { caseRef: string; resolution: CaseConflictResolution }): Promise<CaseConflict[]> =>
      api.post(`/api/cases/conflicts/${encodeURIComponent(intakeId)}/${encodeURIComponent(caseRef)}`, z.array(caseConflictSchema), { resolution }),
    onSuccess: (list) => {
      qc.setQueryData(conflictsKey(intakeId), list);
      return qc.invalidateQueries({ queryKey: intakeKeys.detail(intakeId), exact: true });
    },
  });
}

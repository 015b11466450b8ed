import { runStrataSchema, type RunStrata, type RunStrataQuery } from '@ratewarden/shared/runs';
import { keepPreviousData, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { runKeys } from '../../../api/run-keys';

export function getRunStrata(runId: string, q: RunStrataQuery, signal?: AbortSignal): Promise<RunStrata> {
  const params = new URLSearchParams();
  for (const [k, v] of Object.entries(q)) if (v !== undefined) params.set(k, String(v));
  return api.get(`/api/runs/${encodeURIComponent(runId)}/strata?${params}`, runStrataSchema, signal);
}

/** A run's strata never change once stored; the previous table stays while the next one loads. */
export function useRunStrata(runId: string, q: RunStrataQuery | null) {
  return useQuery({
    queryKey: q ? runKeys.strata(runId, q) : [...runKeys.all, 'strata', runId, 'none'],
    queryFn: ({ signal }) => getRunStrata(runId, q!, signal),
    enabled: q !== null,
    staleTime: Infinity,
    placeholderData: keepPreviousData,
  });
}

import { runPeriodIndexSchema, type RunPeriodIndex, type RunPeriodIndexQuery } from '@ratewarden/shared/runs';
import { keepPreviousData, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { runKeys } from '../../../api/run-keys';

export function getRunPeriods(runId: string, q: RunPeriodIndexQuery, signal?: AbortSignal): Promise<RunPeriodIndex> {
  const params = new URLSearchParams();
  for (const [k, v] of Object.entries(q)) if (v !== undefined) params.set(k, String(v));
  return api.get(`/api/runs/${encodeURIComponent(runId)}/periods?${params}`, runPeriodIndexSchema, signal);
}

/** The periods of one outcome's window: a run's never change, so they stay fresh while the page lives. */
export function useRunPeriods(runId: string | undefined, q: Partial<RunPeriodIndexQuery>) {
  return useQuery({
    queryKey: runKeys.periods(runId ?? '', q),
    queryFn: ({ signal }) => getRunPeriods(runId!, q as RunPeriodIndexQuery, signal),
    enabled: Boolean(runId && q.outcomeId && q.window),
    staleTime: Infinity,
    placeholderData: keepPreviousData,
  });
}

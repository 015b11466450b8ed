import { runResultSchema, type RunResult, type RunResultsQuery } from '@ratewarden/shared/runs';
import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../../lib/api-client';
import { runKeys } from '../../../api/run-keys';

export function getRunResults(runId: string, q: RunResultsQuery, signal?: AbortSignal): Promise<RunResult[]> {
  const params = new URLSearchParams();
  for (const [k, v] of Object.entries(q)) if (v !== undefined) params.set(k, String(v));
  return api.get(`/api/runs/${encodeURIComponent(runId)}/results?${params}`, z.array(runResultSchema), signal);
}

/** A run's results never change once stored, so they stay fresh for as long as the page lives. */
export const runResultsQueryOptions = (runId: string, q: RunResultsQuery) =>
  queryOptions({ queryKey: runKeys.results(runId, q), queryFn: ({ signal }) => getRunResults(runId, q, signal), staleTime: Infinity });

/** Keeps the previous outcome's figures on screen while the next one loads, so the filters stay put. */
export function useRunResults(runId: string, q: RunResultsQuery, enabled = true) {
  return useQuery({ ...runResultsQueryOptions(runId, q), placeholderData: keepPreviousData, enabled: enabled && runId !== '' && q.outcomeId !== undefined });
}

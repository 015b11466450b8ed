import { runSummarySchema, type RunSummary } from '@ratewarden/shared/runs';
import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../../lib/api-client';
import { runKeys } from '../../../api/run-keys';

export function getRuns(signal?: AbortSignal): Promise<RunSummary[]> {
  return api.get('/api/runs', z.array(runSummarySchema), signal);
}

/** A run in progress changes state within seconds, so the list refreshes while one is running. */
export const runsQueryOptions = () =>
  queryOptions({
    queryKey: runKeys.list(),
    queryFn: ({ signal }) => getRuns(signal),
    refetchInterval: (q) => (q.state.data?.some((r) => r.state === 'running') ? 3_000 : false),
  });

export function useRuns() {
  return useSuspenseQuery(runsQueryOptions());
}

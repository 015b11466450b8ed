import { pendingRunSchema, type PendingRunAnswer } from '@ratewarden/shared/runs';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../lib/api-client';
import { runKeys } from './run-keys';

export function getPendingRun(signal?: AbortSignal): Promise<PendingRunAnswer> {
  return api.get('/api/runs/pending', pendingRunSchema, signal);
}

export const pendingRunQueryOptions = () => queryOptions({ queryKey: runKeys.pending(), queryFn: ({ signal }) => getPendingRun(signal) });

/** Run requests waiting for the worker; polled while some wait, so the page sees the run start. */
export function usePendingRun(enabled = true) {
  return useQuery({ ...pendingRunQueryOptions(), enabled, refetchInterval: (q) => (q.state.data?.pending ? 5_000 : false) });
}

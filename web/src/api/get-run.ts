import { runDetailSchema, type RunDetail } from '@ratewarden/shared/runs';
import { queryOptions, useQuery, useSuspenseQuery } from '@tanstack/react-query';
import { api } from '../lib/api-client';
import { isApiError } from '../lib/api-error';
import { runKeys } from './run-keys';

export function getRun(id: string, signal?: AbortSignal): Promise<RunDetail> {
  return api.get(`/api/runs/${encodeURIComponent(id)}`, runDetailSchema, signal);
}

export const runQueryOptions = (id: string) => queryOptions({ queryKey: runKeys.detail(id), queryFn: ({ signal }) => getRun(id, signal) });

/** The live run, or null before any run has succeeded (the API answers 404 then). */
export async function getCurrentRun(signal?: AbortSignal): Promise<RunDetail | null> {
  try {
    return await getRun('current', signal);
  } catch (e) {
    if (isApiError(e) && e.status === 404) return null;
    throw e;
  }
}

export const currentRunQueryOptions = () => queryOptions({ queryKey: runKeys.detail('current'), queryFn: ({ signal }) => getCurrentRun(signal) });

export function useCurrentRun() {
  return useSuspenseQuery(currentRunQueryOptions());
}

export function useRun(id: string | null) {
  return useQuery({ ...runQueryOptions(id ?? ''), enabled: id !== null });
}

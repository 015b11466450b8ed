import { runDiffSchema, type RunDiff } from '@ratewarden/shared/runs';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { runKeys } from '../../../api/run-keys';

export function getRunDiff(from: string, to: string, signal?: AbortSignal): Promise<RunDiff> {
  return api.get(`/api/runs/diff?${new URLSearchParams({ from, to })}`, runDiffSchema, signal);
}

export const runDiffQueryOptions = (from: string, to: string) =>
  queryOptions({ queryKey: runKeys.diff(from, to), queryFn: ({ signal }) => getRunDiff(from, to, signal), staleTime: Infinity });

export function useRunDiff(pair: { from: string; to: string } | null) {
  return useQuery({ ...runDiffQueryOptions(pair?.from ?? '', pair?.to ?? ''), enabled: pair !== null });
}

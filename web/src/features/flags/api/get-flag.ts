import { flagDetailSchema, type FlagDetail } from '@ratewarden/shared/flags';
import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { flagKeys } from '../../../api/flag-keys';

export function getFlag(id: string, signal?: AbortSignal): Promise<FlagDetail> {
  return api.get(`/api/flags/${encodeURIComponent(id)}`, flagDetailSchema, signal);
}

export const flagQueryOptions = (id: string) => queryOptions({ queryKey: flagKeys.detail(id), queryFn: ({ signal }) => getFlag(id, signal) });

export function useFlag(id: string) {
  return useSuspenseQuery(flagQueryOptions(id));
}

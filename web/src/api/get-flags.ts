import { flagSchema, type Flag } from '@ratewarden/shared/flags';
import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../lib/api-client';
import { flagKeys, type FlagFilters } from './flag-keys';

export function getFlags(f: FlagFilters, signal?: AbortSignal): Promise<Flag[]> {
  const q = new URLSearchParams();
  if (f.state) q.set('state', f.state);
  if (f.outcomeId) q.set('outcomeId', String(f.outcomeId));
  return api.get(`/api/flags?${q}`, z.array(flagSchema), signal);
}

export const flagsQueryOptions = (f: FlagFilters) => queryOptions({ queryKey: flagKeys.list(f), queryFn: ({ signal }) => getFlags(f, signal) });

export function useFlags(f: FlagFilters) {
  return useSuspenseQuery(flagsQueryOptions(f));
}

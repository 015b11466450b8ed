import { configChangeSchema, type ConfigChange } from '@ratewarden/shared/groups';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../../lib/api-client';
import { configKeys } from '../../../api/config-keys';

export function getConfigHistory(kind: 'group' | 'outcome', id: number, signal?: AbortSignal): Promise<ConfigChange[]> {
  return api.get(`/api/${kind === 'group' ? 'groups' : 'outcomes'}/${id}/history`, z.array(configChangeSchema), signal);
}

export const configHistoryQueryOptions = (kind: 'group' | 'outcome', id: number) =>
  queryOptions({ queryKey: configKeys.history(kind, id), queryFn: ({ signal }) => getConfigHistory(kind, id, signal) });

export function useConfigHistory(kind: 'group' | 'outcome', id: number | null) {
  return useQuery({ ...configHistoryQueryOptions(kind, id ?? 0), enabled: id !== null });
}

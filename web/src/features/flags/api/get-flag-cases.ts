import { flagCaseSchema, type FlagCase } from '@ratewarden/shared/flags';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../../lib/api-client';
import { flagKeys } from '../../../api/flag-keys';

/** Case-level records behind a flag: the server answers only the physician (and audits the read). */
export function getFlagCases(id: string, signal?: AbortSignal): Promise<FlagCase[]> {
  return api.get(`/api/flags/${encodeURIComponent(id)}/cases`, z.array(flagCaseSchema), signal);
}

export const flagCasesQueryOptions = (id: string) => queryOptions({ queryKey: flagKeys.cases(id), queryFn: ({ signal }) => getFlagCases(id, signal) });

export function useFlagCases(id: string, enabled: boolean) {
  return useQuery({ ...flagCasesQueryOptions(id), enabled });
}

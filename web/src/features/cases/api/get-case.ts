import { caseDetailSchema, type CaseDetail } from '@ratewarden/shared/cases';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { caseKeys } from './case-keys';

/** One case with every version: physician only, each opening recorded. */
export function getCase(ref: string, signal?: AbortSignal): Promise<CaseDetail> {
  return api.get(`/api/cases/${encodeURIComponent(ref)}`, caseDetailSchema, signal);
}

export const caseQueryOptions = (ref: string) => queryOptions({ queryKey: caseKeys.detail(ref), queryFn: ({ signal }) => getCase(ref, signal) });

export function useCase(ref: string) {
  return useQuery(caseQueryOptions(ref));
}

import { caseSummarySchema, type CaseSummary } from '@ratewarden/shared/cases';
import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../../lib/api-client';
import { caseKeys, caseQueryString, type CaseFilters } from './case-keys';

/** The physician's case register, filtered: the server answers only the physician and records each read. */
export function getCases(f: CaseFilters, signal?: AbortSignal): Promise<CaseSummary[]> {
  return api.get(`/api/cases${caseQueryString(f)}`, z.array(caseSummarySchema), signal);
}

export const casesQueryOptions = (f: CaseFilters) => queryOptions({ queryKey: caseKeys.list(f), queryFn: ({ signal }) => getCases(f, signal) });

export function useCases(f: CaseFilters) {
  return useQuery({ ...casesQueryOptions(f), placeholderData: keepPreviousData });
}

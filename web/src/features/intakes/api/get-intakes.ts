import { intakeListResponseSchema, type IntakeListResponse } from '@ratewarden/shared/intake-schemas';
import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { intakeKeys } from './intake-keys';

export interface IntakeFilters {
  kind?: 'roster' | 'cases';
  state?: 'received' | 'checked' | 'applied' | 'rejected' | 'superseded';
  offset: number;
}

export function getIntakes(f: IntakeFilters, signal?: AbortSignal): Promise<IntakeListResponse> {
  const q = new URLSearchParams({ limit: '50', offset: String(f.offset) });
  if (f.kind) q.set('kind', f.kind);
  if (f.state) q.set('state', f.state);
  return api.get(`/api/intakes?${q}`, intakeListResponseSchema, signal);
}

export const intakesQueryOptions = (f: IntakeFilters) => queryOptions({ queryKey: intakeKeys.list(f), queryFn: ({ signal }) => getIntakes(f, signal) });

export function useIntakes(f: IntakeFilters) {
  return useSuspenseQuery(intakesQueryOptions(f));
}

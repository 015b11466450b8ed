import { intakeDetailSchema, type IntakeDetail } from '@ratewarden/shared/intake-schemas';
import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { intakeKeys } from './intake-keys';

export function getIntake(id: string, signal?: AbortSignal): Promise<IntakeDetail> {
  return api.get(`/api/intakes/${encodeURIComponent(id)}`, intakeDetailSchema, signal);
}

export const intakeQueryOptions = (id: string) => queryOptions({ queryKey: intakeKeys.detail(id), queryFn: ({ signal }) => getIntake(id, signal) });

export function useIntake(id: string) {
  return useSuspenseQuery(intakeQueryOptions(id));
}

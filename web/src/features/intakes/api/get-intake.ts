import { intakeDetailSchema, type IntakeDetail } from '@ratewarden/shared/intake-schemas';
import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { intakeKeys } from './intake-keys';

export function getIntake(id: string, signal?: AbortSignal): Promise<IntakeDetail> {
  return api.get(`/api/intakes/${encodeURIComponent(id)}`, intakeDetailSchema, signal);
}

/** While a requested run has not finished, the page asks again every few seconds to show it complete. */
const waitingForRun = (d: IntakeDetail | undefined) => !!d?.runRequest && (!d.runRequest.run || d.runRequest.run.state === 'running');

export const intakeQueryOptions = (id: string) =>
  queryOptions({
    queryKey: intakeKeys.detail(id),
    queryFn: ({ signal }) => getIntake(id, signal),
    refetchInterval: (query) => (waitingForRun(query.state.data) ? 3_000 : false),
  });

export function useIntake(id: string) {
  return useSuspenseQuery(intakeQueryOptions(id));
}

import { intakeFormatsSchema, type IntakeFormats } from '@ratewarden/shared/intake-formats';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

export function getIntakeFormats(signal?: AbortSignal): Promise<IntakeFormats> {
  return api.get('/api/intakes/formats', intakeFormatsSchema, signal);
}

/** The formats change only with a new version of the app (a key of their own: intake changes do not touch them). */
export const intakeFormatsQueryOptions = () =>
  queryOptions({ queryKey: ['intake-formats'], queryFn: ({ signal }) => getIntakeFormats(signal), staleTime: Infinity });

export function useIntakeFormats() {
  return useQuery(intakeFormatsQueryOptions());
}

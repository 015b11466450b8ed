import { unattributedListSchema, type UnattributedList } from '@ratewarden/shared/unattributed';
import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { isApiError } from '../../../lib/api-error';
import { runKeys } from '../../../api/run-keys';

/**
 * The live run's unattributed cases, one by one: the server answers only the physician (and
 * audits the read); null before any run has succeeded (the API answers 404 then).
 */
export async function getUnattributed(signal?: AbortSignal): Promise<UnattributedList | null> {
  try {
    return await api.get('/api/runs/current/unattributed', unattributedListSchema, signal);
  } catch (e) {
    if (isApiError(e) && e.status === 404) return null;
    throw e;
  }
}

export const unattributedQueryOptions = () => queryOptions({ queryKey: runKeys.unattributed(), queryFn: ({ signal }) => getUnattributed(signal) });

export function useUnattributed() {
  return useSuspenseQuery(unattributedQueryOptions());
}

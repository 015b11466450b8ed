import { hearingWorkerListResponseSchema } from '@ratewarden/shared/hearing/hearing-view';
import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { hearingKeys } from './hearing-keys';

/** Workers with audiograms (physician only; the server records each read). */
export const getHearingWorkers = (signal?: AbortSignal) => api.get('/api/audiograms/workers', hearingWorkerListResponseSchema, signal);

export const hearingWorkersQueryOptions = () => queryOptions({ queryKey: hearingKeys.workers(), queryFn: ({ signal }) => getHearingWorkers(signal) });

export function useHearingWorkers() {
  return useSuspenseQuery(hearingWorkersQueryOptions());
}

import { hearingWorkerResponseSchema } from '@ratewarden/shared/hearing/hearing-view';
import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { hearingKeys } from './hearing-keys';

/** One worker's audiograms, baselines and shifts with their computation (physician only, audited). */
export const getHearingWorker = (workerKey: string, signal?: AbortSignal) =>
  api.get(`/api/audiograms/workers/${encodeURIComponent(workerKey)}`, hearingWorkerResponseSchema, signal);

export const hearingWorkerQueryOptions = (workerKey: string) =>
  queryOptions({ queryKey: hearingKeys.worker(workerKey), queryFn: ({ signal }) => getHearingWorker(workerKey, signal) });

export function useHearingWorker(workerKey: string) {
  return useSuspenseQuery(hearingWorkerQueryOptions(workerKey));
}

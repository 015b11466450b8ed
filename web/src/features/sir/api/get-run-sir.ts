import { sirAnswerSchema, type SirAnswer } from '@ratewarden/shared/reference-rates';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { sirKeys } from './sir-keys';

export interface SirQuery {
  outcomeId?: number;
  siteId?: number;
}

export function getRunSir(runId: string, q: SirQuery, signal?: AbortSignal): Promise<SirAnswer> {
  const params = new URLSearchParams();
  if (q.outcomeId !== undefined) params.set('outcomeId', String(q.outcomeId));
  if (q.siteId !== undefined) params.set('siteId', String(q.siteId));
  return api.get(`/api/reference-rates/runs/${encodeURIComponent(runId)}/sir?${params}`, sirAnswerSchema, signal);
}

export const runSirQueryOptions = (runId: string, q: SirQuery) =>
  queryOptions({ queryKey: sirKeys.sir(runId, q), queryFn: ({ signal }) => getRunSir(runId, q, signal) });

export function useRunSir(runId: string | undefined, q: SirQuery) {
  return useQuery({ ...runSirQueryOptions(runId ?? '', q), enabled: !!runId && q.outcomeId !== undefined });
}

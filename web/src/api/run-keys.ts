import type { RunPeriodIndexQuery, RunResultsQuery, RunStrataQuery } from '@ratewarden/shared/runs';

/** Query keys of runs, general to specific; a new run invalidates everything under `all`. */
export const runKeys = {
  all: ['runs'] as const,
  list: () => [...runKeys.all, 'list'] as const,
  details: () => [...runKeys.all, 'detail'] as const,
  detail: (id: string) => [...runKeys.details(), id] as const,
  results: (id: string, q: RunResultsQuery) => [...runKeys.all, 'results', id, q] as const,
  periods: (id: string, q: Partial<RunPeriodIndexQuery>) => [...runKeys.all, 'periods', id, q] as const,
  strata: (id: string, q: RunStrataQuery) => [...runKeys.all, 'strata', id, q] as const,
  diff: (from: string, to: string) => [...runKeys.all, 'diff', from, to] as const,
  unattributed: () => [...runKeys.all, 'unattributed'] as const,
  pending: () => [...runKeys.all, 'pending'] as const,
};

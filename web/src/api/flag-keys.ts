import type { FlagState } from '@ratewarden/shared/flags';

/** Query keys of flags; a review or close invalidates every flag query (lists and counts change). */
export interface FlagFilters {
  state?: FlagState;
  outcomeId?: number;
}

export const flagKeys = {
  all: ['flags'] as const,
  lists: () => [...flagKeys.all, 'list'] as const,
  list: (f: FlagFilters) => [...flagKeys.lists(), f] as const,
  detail: (id: string) => [...flagKeys.all, 'detail', id] as const,
  cases: (id: string) => [...flagKeys.all, 'cases', id] as const,
};

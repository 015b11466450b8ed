import type { CaseListQuery } from '@ratewarden/shared/cases';

/** Query keys of the case register; a review invalidates them all (statuses and versions change). */
export type CaseFilters = Partial<Omit<CaseListQuery, 'limit'>>;

export const caseKeys = {
  all: ['cases'] as const,
  lists: () => [...caseKeys.all, 'list'] as const,
  list: (f: CaseFilters) => [...caseKeys.lists(), f] as const,
  detail: (ref: string) => [...caseKeys.all, 'detail', ref] as const,
};

/** The filters as a query string, leaving out the empty ones. */
export function caseQueryString(f: CaseFilters): string {
  const q = new URLSearchParams();
  for (const [k, v] of Object.entries(f)) if (v !== undefined && v !== '') q.set(k, String(v));
  const s = q.toString();
  return s ? `?${s}` : '';
}

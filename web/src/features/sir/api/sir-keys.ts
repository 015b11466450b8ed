/** Query keys of reference rates and SIRs, general to specific; an upload invalidates `all`. */
export const sirKeys = {
  all: ['reference-rates'] as const,
  tables: () => [...sirKeys.all, 'tables'] as const,
  sir: (runId: string, q: { outcomeId?: number; siteId?: number }) => [...sirKeys.all, 'sir', runId, q] as const,
};

/** Query keys of intakes, general to specific, so a mutation can invalidate by prefix. */
export const intakeKeys = {
  all: ['intakes'] as const,
  lists: () => [...intakeKeys.all, 'list'] as const,
  list: (filters: { kind?: string; state?: string; offset: number }) => [...intakeKeys.lists(), filters] as const,
  details: () => [...intakeKeys.all, 'detail'] as const,
  detail: (id: string) => [...intakeKeys.details(), id] as const,
};

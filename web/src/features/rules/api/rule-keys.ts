/** Query keys of watch rules. */
export const ruleKeys = {
  all: ['rules'] as const,
  list: () => [...ruleKeys.all, 'list'] as const,
  detail: (id: string) => [...ruleKeys.all, 'detail', id] as const,
};

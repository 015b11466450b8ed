/** Query keys of the configuration the hygienist keeps: sites, exposure groups, outcomes. */
export const configKeys = {
  all: ['config'] as const,
  sites: () => [...configKeys.all, 'sites'] as const,
  groups: () => [...configKeys.all, 'groups'] as const,
  outcomes: () => [...configKeys.all, 'outcomes'] as const,
};

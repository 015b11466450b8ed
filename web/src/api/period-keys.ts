/** Query keys of reporting periods; closing or reopening a month invalidates them all. */
export const periodKeys = {
  all: ['periods'] as const,
  calendar: (q: { from?: string; to?: string }) => [...periodKeys.all, 'calendar', q] as const,
};

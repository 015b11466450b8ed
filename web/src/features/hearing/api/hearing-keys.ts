/** Query keys of the audiogram reads, general to specific; an upload invalidates `all`. */
export const hearingKeys = {
  all: ['hearing'] as const,
  workers: () => [...hearingKeys.all, 'workers'] as const,
  worker: (workerKey: string) => [...hearingKeys.all, 'worker', workerKey] as const,
};

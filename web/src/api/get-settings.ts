import { analysisSettingsSchema, type AnalysisSettings } from '@ratewarden/shared/settings';
import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import { api } from '../lib/api-client';

export const settingsKeys = { all: ['settings'] as const };

export function getSettings(signal?: AbortSignal): Promise<AnalysisSettings> {
  return api.get('/api/settings', analysisSettingsSchema, signal);
}

export const settingsQueryOptions = () => queryOptions({ queryKey: settingsKeys.all, queryFn: ({ signal }) => getSettings(signal) });

export function useAnalysisSettings() {
  return useSuspenseQuery(settingsQueryOptions());
}

import { siteSchema, type SiteDto } from '@ratewarden/shared/groups';
import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../lib/api-client';
import { configKeys } from './config-keys';

export function getSites(signal?: AbortSignal): Promise<SiteDto[]> {
  return api.get('/api/sites', z.array(siteSchema), signal);
}

export const sitesQueryOptions = () => queryOptions({ queryKey: configKeys.sites(), queryFn: ({ signal }) => getSites(signal), staleTime: 300_000 });

export function useSites() {
  return useSuspenseQuery(sitesQueryOptions());
}

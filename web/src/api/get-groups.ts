import { exposureGroupSchema, type ExposureGroupDto } from '@ratewarden/shared/groups';
import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../lib/api-client';
import { configKeys } from './config-keys';

export function getGroups(signal?: AbortSignal): Promise<ExposureGroupDto[]> {
  return api.get('/api/groups', z.array(exposureGroupSchema), signal);
}

export const groupsQueryOptions = () => queryOptions({ queryKey: configKeys.groups(), queryFn: ({ signal }) => getGroups(signal) });

export function useGroups() {
  return useSuspenseQuery(groupsQueryOptions());
}

import { outcomeSchema, type OutcomeDto } from '@ratewarden/shared/groups';
import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../lib/api-client';
import { configKeys } from './config-keys';

export function getOutcomes(signal?: AbortSignal): Promise<OutcomeDto[]> {
  return api.get('/api/outcomes', z.array(outcomeSchema), signal);
}

export const outcomesQueryOptions = () => queryOptions({ queryKey: configKeys.outcomes(), queryFn: ({ signal }) => getOutcomes(signal) });

export function useOutcomes() {
  return useSuspenseQuery(outcomesQueryOptions());
}

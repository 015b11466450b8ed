import { referenceTableSchema, type ReferenceTable } from '@ratewarden/shared/reference-rates';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { sirKeys } from './sir-keys';

export function getReferenceTables(signal?: AbortSignal): Promise<ReferenceTable[]> {
  return api.get('/api/reference-rates', referenceTableSchema.array(), signal);
}

export const referenceTablesQueryOptions = () => queryOptions({ queryKey: sirKeys.tables(), queryFn: ({ signal }) => getReferenceTables(signal) });

export function useReferenceTables() {
  return useQuery(referenceTablesQueryOptions());
}

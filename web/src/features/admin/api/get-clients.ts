import { integrationClientSchema, type ClientRegistration, type IntegrationClientView } from '@ratewarden/shared/admin';
import { queryOptions, useMutation, useQueryClient, useSuspenseQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../../lib/api-client';
import { adminKeys } from './admin-keys';

export function getClients(signal?: AbortSignal): Promise<IntegrationClientView[]> {
  return api.get('/api/admin/clients', z.array(integrationClientSchema), signal);
}

export const clientsQueryOptions = () => queryOptions({ queryKey: adminKeys.clients(), queryFn: ({ signal }) => getClients(signal) });

export function useClients() {
  return useSuspenseQuery(clientsQueryOptions());
}

function useClientMutation<V>(fn: (v: V) => Promise<unknown>) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: fn,
    onSuccess: async () => {
      await qc.invalidateQueries({ queryKey: adminKeys.clients() });
      await qc.invalidateQueries({ queryKey: adminKeys.audits() });
    },
  });
}

export function useRegisterClient() {
  return useClientMutation((body: ClientRegistration) => api.post('/api/admin/clients', integrationClientSchema, body));
}

export function useRevokeClient() {
  return useClientMutation((clientId: string) => api.post(`/api/admin/clients/${encodeURIComponent(clientId)}/revoke`, integrationClientSchema));
}

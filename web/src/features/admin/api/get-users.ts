import { adminUserSchema, type AdminUser, type UserAccessUpdate, type UserInvite } from '@ratewarden/shared/admin';
import { queryOptions, useMutation, useQueryClient, useSuspenseQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../../lib/api-client';
import { adminKeys } from './admin-keys';

export function getUsers(signal?: AbortSignal): Promise<AdminUser[]> {
  return api.get('/api/admin/users', z.array(adminUserSchema), signal);
}

export const usersQueryOptions = () => queryOptions({ queryKey: adminKeys.users(), queryFn: ({ signal }) => getUsers(signal) });

export function useUsers() {
  return useSuspenseQuery(usersQueryOptions());
}

/** Every change to people is audited, so the audit queries go stale with the people list. */
function useAdminMutation<V>(fn: (v: V) => Promise<unknown>) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: fn,
    onSuccess: async () => {
      await qc.invalidateQueries({ queryKey: adminKeys.users() });
      await qc.invalidateQueries({ queryKey: adminKeys.audits() });
    },
  });
}

export function useInviteUser() {
  return useAdminMutation((body: UserInvite) => api.post('/api/admin/users', adminUserSchema, body));
}

export function useUpdateUserAccess() {
  return useAdminMutation(({ id, body }: { id: string; body: UserAccessUpdate }) =>
    api.patch(`/api/admin/users/${encodeURIComponent(id)}`, adminUserSchema, body),
  );
}

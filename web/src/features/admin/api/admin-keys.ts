import type { AuditQuery } from '@ratewarden/shared/admin';

/** Query keys of the administrator's pages. */
export const adminKeys = {
  all: ['admin'] as const,
  users: () => [...adminKeys.all, 'users'] as const,
  clients: () => [...adminKeys.all, 'clients'] as const,
  audits: () => [...adminKeys.all, 'audit'] as const,
  audit: (q: Partial<AuditQuery>) => [...adminKeys.audits(), q] as const,
};

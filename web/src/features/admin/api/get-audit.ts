import { auditEventSchema, type AuditEventView, type AuditQuery } from '@ratewarden/shared/admin';
import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../../lib/api-client';
import { adminKeys } from './admin-keys';

export type AuditFilters = Partial<Pick<AuditQuery, 'action' | 'actor' | 'from' | 'to' | 'before'>>;

export function getAudit(f: AuditFilters, signal?: AbortSignal): Promise<AuditEventView[]> {
  const q = new URLSearchParams({ limit: '200' });
  for (const [k, v] of Object.entries(f)) if (v !== undefined && v !== '') q.set(k, String(v));
  return api.get(`/api/admin/audit?${q}`, z.array(auditEventSchema), signal);
}

export const auditQueryOptions = (f: AuditFilters) => queryOptions({ queryKey: adminKeys.audit(f), queryFn: ({ signal }) => getAudit(f, signal) });

export function useAudit(f: AuditFilters) {
  return useQuery({ ...auditQueryOptions(f), placeholderData: keepPreviousData });
}

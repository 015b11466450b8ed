import { siteSchema, type SiteCreate, type SiteUpdate } from '@ratewarden/shared/groups';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { configKeys } from '../../../api/config-keys';
import { periodKeys } from '../../../api/period-keys';

export type SiteSave = { id: null; body: SiteCreate } | { id: number; body: SiteUpdate };

export function saveSite(s: SiteSave) {
  return s.id === null ? api.post('/api/sites', siteSchema, s.body) : api.patch(`/api/sites/${s.id}`, siteSchema, s.body);
}

export function setSiteRetired({ id, retired }: { id: number; retired: boolean }) {
  return api.post(`/api/sites/${id}/${retired ? 'retire' : 'reinstate'}`, siteSchema);
}

export function useSaveSite() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: saveSite, onSuccess: () => qc.invalidateQueries({ queryKey: configKeys.sites() }) });
}

/** Retiring changes which sites are expected to report: the calendar is read again too. */
export function useSetSiteRetired() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: setSiteRetired,
    onSuccess: () => Promise.all([qc.invalidateQueries({ queryKey: configKeys.sites() }), qc.invalidateQueries({ queryKey: periodKeys.all })]),
  });
}

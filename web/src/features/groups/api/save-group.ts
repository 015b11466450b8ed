import { exposureGroupSchema, type ExposureGroupCreate, type ExposureGroupUpdate } from '@ratewarden/shared/groups';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../../lib/api-client';
import { configKeys } from '../../../api/config-keys';

export type GroupSave = { id: null; body: ExposureGroupCreate } | { id: number; body: ExposureGroupUpdate };

export function saveGroup(s: GroupSave) {
  return s.id === null ? api.post('/api/groups', exposureGroupSchema, s.body) : api.patch(`/api/groups/${s.id}`, exposureGroupSchema, s.body);
}

export function setReferenceGroup(id: number) {
  return api.post(`/api/groups/${id}/reference`, z.array(exposureGroupSchema));
}

/** Groups feed every comparison, so a change invalidates all configuration queries. */
export function useSaveGroup() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: saveGroup, onSuccess: () => qc.invalidateQueries({ queryKey: configKeys.all }) });
}

export function useSetReferenceGroup() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: setReferenceGroup, onSuccess: () => qc.invalidateQueries({ queryKey: configKeys.all }) });
}

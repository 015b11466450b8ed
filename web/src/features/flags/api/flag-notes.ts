import { flagNoteSchema, type FlagNote } from '@ratewarden/shared/flags';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../../lib/api-client';
import { flagKeys } from '../../../api/flag-keys';

const notesKey = (id: string) => [...flagKeys.detail(id), 'notes'] as const;

/** A flag's clinical notes: the server answers only the physician and records each read. */
export function useFlagNotes(id: string) {
  return useQuery({ queryKey: notesKey(id), queryFn: ({ signal }) => api.get(`/api/flags/${encodeURIComponent(id)}/notes`, z.array(flagNoteSchema), signal) });
}

export function useAddFlagNote(id: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (text: string): Promise<FlagNote[]> => api.post(`/api/flags/${encodeURIComponent(id)}/notes`, z.array(flagNoteSchema), { text }),
    onSuccess: (notes) => qc.setQueryData(notesKey(id), notes),
  });
}

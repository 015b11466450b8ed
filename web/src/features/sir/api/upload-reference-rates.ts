import { referenceTableSchema } from '@ratewarden/shared/reference-rates';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { uploadWithProgress } from '../../../lib/upload-with-progress';
import { sirKeys } from './sir-keys';

const uploadAnswer = z.object({ table: referenceTableSchema, duplicate: z.boolean() });

export function uploadReferenceRates({ file, onProgress }: { file: File; onProgress: (fraction: number) => void }) {
  const form = new FormData();
  form.append('file', file, file.name);
  return uploadWithProgress('/api/reference-rates', form, uploadAnswer, onProgress);
}

export function useUploadReferenceRates() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: uploadReferenceRates, onSettled: () => qc.invalidateQueries({ queryKey: sirKeys.all }) });
}

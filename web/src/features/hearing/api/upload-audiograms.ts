import { audiogramUploadResponseSchema } from '@ratewarden/shared/hearing/hearing-view';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { uploadWithProgress } from '../../../lib/upload-with-progress';
import { hearingKeys } from './hearing-keys';

export interface AudiogramUploadVars {
  file: File;
  onProgress: (fraction: number) => void;
}

export function uploadAudiograms({ file, onProgress }: AudiogramUploadVars) {
  const form = new FormData();
  form.append('file', file, file.name);
  return uploadWithProgress('/api/audiograms', form, audiogramUploadResponseSchema, onProgress);
}

export function useUploadAudiograms() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: uploadAudiograms, onSettled: () => qc.invalidateQueries({ queryKey: hearingKeys.all }) });
}

import type { IntakeKind } from '@ratewarden/shared/intake';
import { intakeUploadResponseSchema } from '@ratewarden/shared/intake-schemas';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { uploadWithProgress } from '../../../lib/upload-with-progress';
import { intakeKeys } from './intake-keys';

export interface UploadVars {
  file: File;
  kind: IntakeKind;
  mode: 'check' | 'apply';
  /** Case lists: the last month the list reports (YYYY-MM); empty for the default. */
  reportsThrough?: string;
  onProgress: (fraction: number) => void;
}

export function uploadIntake({ file, kind, mode, reportsThrough, onProgress }: UploadVars) {
  const form = new FormData();
  form.append('file', file, file.name);
  const query = new URLSearchParams({ kind, mode, ...(kind === 'cases' && reportsThrough ? { reportsThrough } : {}) });
  return uploadWithProgress(`/api/intakes?${query}`, form, intakeUploadResponseSchema, onProgress);
}

export function useUploadIntake() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: uploadIntake, onSettled: () => qc.invalidateQueries({ queryKey: intakeKeys.all }) });
}

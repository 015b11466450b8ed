import { runRequestedSchema } from '@ratewarden/shared/runs';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { runKeys } from '../../../api/run-keys';

export function requestRun() {
  return api.post('/api/runs', runRequestedSchema);
}

/** The run button: the worker picks the request up within seconds; the list polls until it shows. */
export function useRequestRun() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: requestRun, onSuccess: () => qc.invalidateQueries({ queryKey: runKeys.all }) });
}

import type { ClosePeriodBody } from '@ratewarden/shared/period-calendar';
import { sitePeriodSchema } from '@ratewarden/shared/periods';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { periodKeys } from '../../../api/period-keys';
import { runKeys } from '../../../api/run-keys';

export function closePeriod(body: ClosePeriodBody) {
  return api.post('/api/periods/close', sitePeriodSchema, body);
}

/** Close a site × month; the calendar and the waiting run are read again. */
export function useClosePeriod() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: closePeriod,
    onSuccess: () => Promise.all([qc.invalidateQueries({ queryKey: periodKeys.all }), qc.invalidateQueries({ queryKey: runKeys.pending() })]),
  });
}

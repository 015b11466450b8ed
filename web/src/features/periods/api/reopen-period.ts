import type { ReopenPeriodBody } from '@ratewarden/shared/period-calendar';
import { sitePeriodSchema } from '@ratewarden/shared/periods';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { periodKeys } from '../../../api/period-keys';
import { runKeys } from '../../../api/run-keys';

export function reopenPeriod(body: ReopenPeriodBody) {
  return api.post('/api/periods/reopen', sitePeriodSchema, body);
}

/** Reopen a closed site × month; the calendar and the waiting run are read again. */
export function useReopenPeriod() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: reopenPeriod,
    onSuccess: () => Promise.all([qc.invalidateQueries({ queryKey: periodKeys.all }), qc.invalidateQueries({ queryKey: runKeys.pending() })]),
  });
}

import { settingsUpdateResultSchema, type SettingsUpdate } from '@ratewarden/shared/settings';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { runKeys } from '../../../api/run-keys';
import { settingsKeys } from '../../../api/get-settings';

export function saveSettings(body: SettingsUpdate) {
  return api.put('/api/settings', settingsUpdateResultSchema, body);
}

/** A new version requests a run: the pending-run note changes too. */
export function useSaveSettings() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: saveSettings,
    onSuccess: () => Promise.all([qc.invalidateQueries({ queryKey: settingsKeys.all }), qc.invalidateQueries({ queryKey: runKeys.pending() })]),
  });
}

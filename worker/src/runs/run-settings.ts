import type { RunSettings } from '@ratewarden/shared/runs';
import type { WorkerConfig } from '../config';

/** The settings a run records with its results, from the worker's configuration. */
export function runSettingsOf(config: WorkerConfig): RunSettings {
  return {
    personTimeBasis: config.RUN_PERSON_TIME_BASIS,
    per: config.RUN_PER,
    confidence: config.RUN_CONFIDENCE,
    countedStatuses: config.RUN_COUNTED_STATUSES,
  };
}

import type { RunSettings } from '@ratewarden/shared/runs';
import { DEFAULT_WINDOWS } from '@ratewarden/shared/windows';
import type { WorkerConfig } from '../config';

/** The analysis settings of a new database, from the worker's configuration (runs use the current version: analysis-settings.ts). */
export function runSettingsOf(config: WorkerConfig): RunSettings {
  return {
    personTimeBasis: config.RUN_PERSON_TIME_BASIS,
    per: config.RUN_PER,
    confidence: config.RUN_CONFIDENCE,
    countedStatuses: config.RUN_COUNTED_STATUSES,
    ageBandEdges: config.RUN_AGE_BAND_EDGES,
    // Month, rolling 12 months and calendar year; the settings page offers the others.
    windows: [...DEFAULT_WINDOWS],
  };
}

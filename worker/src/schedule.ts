import cron, { type ScheduledTask } from 'node-cron';
import type { WorkerConfig } from './config';

/** Starts the nightly schedule; `onTick` runs at each scheduled time, never twice at once. */
export function startSchedule(config: WorkerConfig, onTick: () => Promise<void>): ScheduledTask {
  return cron.schedule(
    config.RUN_SCHEDULE,
    async () => {
      await onTick();
    },
    { timezone: config.RUN_TIMEZONE, noOverlap: true, name: 'nightly-run' },
  );
}

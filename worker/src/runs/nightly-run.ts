import type { DataSource } from 'typeorm';
import type { RunSettings } from '@ratewarden/shared/runs';
import type { WorkerConfig } from '../config';
import { performRun, type RunOutcome } from './perform-run';

/**
 * The run of one tick of the nightly schedule. Every worker sees the same tick (the minute it
 * fell in), and a run started at or after it counts as that tick's run, so with several workers
 * only the first one runs; the others skip ('already ran'). It also picks up pending run requests.
 */
export function nightlyRun(ds: DataSource, config: WorkerConfig, settings: RunSettings, now = new Date()): Promise<RunOutcome> {
  const tick = new Date(now);
  tick.setSeconds(0, 0);
  return performRun(ds, {
    trigger: 'schedule',
    reason: 'nightly schedule',
    settings,
    appUrl: config.APP_BASE_URL,
    notBefore: tick,
    consumeRequests: true,
    keepComputeThreads: true,
    smallCellThreshold: config.SMALL_CELL_THRESHOLD,
    rulesOnPartialPeriods: config.RULES_ON_PARTIAL_PERIODS,
  });
}

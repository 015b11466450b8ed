import type { DataSource } from 'typeorm';
import type { RunSettings } from '@ratewarden/shared/runs';
import { performRun, type PerformRunOptions, type RunOutcome } from './perform-run';

/**
 * Runs on demand: when a run request is pending (written after an applied intake or by the run
 * button), try a run that consumes the pending requests. The cheap check comes first so idle
 * workers do not contend for the lock; the lock and the re-read under it decide who runs.
 */
export async function runIfRequested(
  ds: DataSource,
  settings: RunSettings,
  appUrl: string,
  options: Pick<PerformRunOptions, 'keepComputeThreads' | 'smallCellThreshold'> = {},
): Promise<RunOutcome | null> {
  const pending: unknown[] = await ds.query(`SELECT 1 FROM run_requests WHERE picked_at IS NULL LIMIT 1`);
  if (pending.length === 0) return null;
  return performRun(ds, { trigger: 'request', settings, appUrl, consumeRequests: true, ...options });
}

import type { DataSource } from 'typeorm';
import { pendingRun } from '@ratewarden/db/run-requests';
import type { RunSettings } from '@ratewarden/shared/runs';
import { performRun, type PerformRunOptions, type RunOutcome } from './perform-run';

export interface RequestPollOptions extends Pick<PerformRunOptions, 'keepComputeThreads' | 'smallCellThreshold' | 'rulesOnPartialPeriods'> {
  /**
   * Seconds the latest pending request must have been quiet before the run (RUN_QUIET_SECONDS;
   * the rule is db/src/run-requests.ts). Default 0: run whatever is pending.
   */
  quietSeconds?: number;
  /** The clock the quiet interval is measured with (tests move it forward); default the database's. */
  now?: Date;
}

/**
 * Runs on demand: when run requests are pending (written after an applied intake, a closed or
 * reopened month, or by the run button) and due, try a run that consumes every pending request.
 * The cheap check comes first so idle workers do not contend for the lock; the lock and the
 * re-read under it decide who runs.
 */
export async function runIfRequested(ds: DataSource, settings: RunSettings, appUrl: string, options: RequestPollOptions = {}): Promise<RunOutcome | null> {
  const { quietSeconds = 0, now, ...runOptions } = options;
  const pending = await pendingRun(ds, quietSeconds, now);
  if (!pending?.due) return null;
  return performRun(ds, { trigger: 'request', settings, appUrl, consumeRequests: true, ...runOptions });
}

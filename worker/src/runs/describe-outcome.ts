import type { RunOutcome } from './perform-run';

/** One log line for a run's outcome. */
export function describeOutcome(o: RunOutcome): string {
  switch (o.status) {
    case 'succeeded':
      return `run ${o.runId} succeeded: ${o.resultCount} results in ${o.seconds.toFixed(2)} s; flags raised ${o.flags.raised}, escalated ${o.flags.escalated}; notices ${o.flags.notices}`;
    case 'failed':
      return `run ${o.runId} failed: ${o.error}`;
    case 'skipped':
      return `run skipped (${o.reason})`;
  }
}

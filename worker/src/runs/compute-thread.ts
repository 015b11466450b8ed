import { parentPort } from 'node:worker_threads';
import type { RunSettings } from '@ratewarden/shared/runs';
import type { GroupInfo } from './compute-results';
import { runJob, type ComputeJob } from './compute-scopes';

/** A compute thread: answers each batch of jobs with their results, in order (see compute-pool.ts). */
export interface BatchRequest {
  id: number;
  jobs: ComputeJob[];
  groups: GroupInfo[];
  settings: RunSettings;
}

parentPort!.on('message', (req: BatchRequest | 'ping') => {
  if (req === 'ping') return parentPort!.postMessage('pong');
  try {
    parentPort!.postMessage({ id: req.id, parts: req.jobs.map((j) => runJob(j, req.groups, req.settings)) });
  } catch (err) {
    parentPort!.postMessage({ id: req.id, error: err instanceof Error ? `${err.message}\n${err.stack ?? ''}` : String(err) });
  }
});

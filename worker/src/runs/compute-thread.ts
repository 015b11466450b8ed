import { parentPort } from 'node:worker_threads';
import type { RunSettings } from '@ratewarden/shared/runs';
import type { GroupInfo } from './compute-results';
import { answerJob, type ComputeJob } from './compute-scopes';

/** A compute thread: answers each batch of jobs with their results, in order (see compute-pool.ts). */
export interface BatchRequest {
  id: number;
  jobs: ComputeJob[];
  groups: GroupInfo[];
  settings: RunSettings;
  runId: string;
}

parentPort!.on('message', (req: BatchRequest | 'ping') => {
  if (req === 'ping') return parentPort!.postMessage('pong');
  try {
    parentPort!.postMessage({ id: req.id, parts: req.jobs.map((j) => answerJob(j, req.groups, req.settings, req.runId)) });
  } catch (err) {
    parentPort!.postMessage({ id: req.id, error: err instanceof Error ? `${err.message}\n${err.stack ?? ''}` : String(err) });
  }
});

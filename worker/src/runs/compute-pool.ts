import { availableParallelism } from 'node:os';
import { Worker } from 'node:worker_threads';
import type { RunSettings } from '@ratewarden/shared/runs';
import type { Cell } from './cells-query';
import type { ComputedResults, GroupInfo, OutcomeInfo } from './compute-results';
import { computeJobs, mergeComputed, runJob, type ComputeJob } from './compute-scopes';
import type { BatchRequest } from './compute-thread';

type Reply = { id: number; parts: ComputedResults[] } | { id: number; error: string };

interface PoolThread {
  worker: Worker;
  ready: Promise<void>;
  pending: Map<number, { resolve: (parts: ComputedResults[]) => void; reject: (err: Error) => void }>;
}

let threads: PoolThread[] | null = null;
let nextId = 1;

/** Threads for a run's statistics: one per core, at most 4; none on a single core. */
export const COMPUTE_THREADS = Math.min(4, availableParallelism());

function startThread(): PoolThread {
  // The thread runs TypeScript like the rest of the worker, through tsx (see its boot file).
  const worker = new Worker(new URL('./compute-thread-boot.mjs', import.meta.url));
  worker.unref(); // an idle pool never keeps the process alive
  const pending: PoolThread['pending'] = new Map();
  const ready = new Promise<void>((resolve, reject) => {
    worker.once('message', (m) => (m === 'pong' ? resolve() : reject(new Error('compute thread did not start'))));
    worker.once('error', reject);
  });
  worker.postMessage('ping');
  worker.on('message', (m: Reply | 'pong') => {
    if (m === 'pong') return;
    const p = pending.get(m.id);
    if (!p) return;
    pending.delete(m.id);
    if ('error' in m) p.reject(new Error(`compute thread: ${m.error}`));
    else p.resolve(m.parts);
  });
  const fail = (err: Error) => {
    for (const p of pending.values()) p.reject(err);
    pending.clear();
    threads = threads?.filter((t) => t.worker !== worker) ?? null;
    if (threads?.length === 0) threads = null;
  };
  worker.on('error', fail);
  worker.on('exit', (code) => fail(new Error(`compute thread exited (${code})`)));
  return { worker, ready, pending };
}

/**
 * Starts the compute threads ahead of need (a run calls it before its aggregation query, so the
 * threads load their code while PostgreSQL works); later runs reuse them.
 */
export function warmComputePool(): void {
  if (COMPUTE_THREADS < 2 || threads) return;
  threads = Array.from({ length: COMPUTE_THREADS }, startThread);
  for (const t of threads) t.ready.catch(() => undefined);
}

function runBatch(t: PoolThread, jobs: ComputeJob[], groups: GroupInfo[], settings: RunSettings): Promise<ComputedResults[]> {
  const id = nextId++;
  return new Promise((resolve, reject) => {
    t.pending.set(id, { resolve, reject });
    t.worker.postMessage({ id, jobs, groups, settings } satisfies BatchRequest);
  });
}

/**
 * A run's statistics (company-wide and per site, see compute-scopes.ts) spread over the compute
 * threads: jobs are dealt costliest first to the least loaded thread, and the
 * answers are joined in job order, so the outcome does not depend on the number of threads.
 * On a single core everything runs on the calling thread.
 */
export async function computeAll(cells: Cell[], outcomes: OutcomeInfo[], groups: GroupInfo[], settings: RunSettings): Promise<ComputedResults> {
  const jobs = computeJobs(cells, outcomes);
  if (COMPUTE_THREADS < 2) return mergeComputed(jobs, jobs.map((j) => runJob(j, groups, settings)));
  warmComputePool();
  const pool = threads!;
  await Promise.all(pool.map((t) => t.ready));
  const load = pool.map(() => 0);
  const assigned: number[][] = pool.map(() => []);
  // Cost follows the number of comparisons, about the same in every scope; the company scope
  // adds the adjustment by site (three Mantel–Haenszel analyses per row instead of two).
  const cost = (j: ComputeJob) => (j.siteId === null ? 1.5 : 1);
  const order = jobs.map((_, i) => i).sort((a, b) => cost(jobs[b]!) - cost(jobs[a]!));
  for (const i of order) {
    const k = load.indexOf(Math.min(...load));
    assigned[k]!.push(i);
    load[k]! += cost(jobs[i]!);
  }
  const answers = await Promise.all(pool.map((t, k) => runBatch(t, assigned[k]!.map((i) => jobs[i]!), groups, settings)));
  const parts: ComputedResults[] = new Array(jobs.length);
  assigned.forEach((list, k) => list.forEach((i, n) => (parts[i] = answers[k]![n]!)));
  return mergeComputed(jobs, parts);
}

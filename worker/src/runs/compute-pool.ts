import { availableParallelism } from 'node:os';
import { Worker } from 'node:worker_threads';
import type { RunSettings } from '@ratewarden/shared/runs';
import type { Cell } from './cells-query';
import type { GroupInfo, OutcomeInfo } from './compute-results';
import { answerJob, computeJobs, mergeAnswers, type ComputeJob, type JobAnswer, type MergedAnswers } from './compute-scopes';
import type { BatchRequest } from './compute-thread';

type Reply = { id: number; parts: JobAnswer[] } | { id: number; error: string };

interface PoolThread {
  worker: Worker;
  ready: Promise<void>;
  pending: Map<number, { resolve: (parts: JobAnswer[]) => void; reject: (err: Error) => void }>;
}

let threads: PoolThread[] | null = null;
let nextId = 1;

/** Threads for a run's statistics: one per core, at most 4; none on a single core. */
export const COMPUTE_THREADS = Math.min(4, availableParallelism());

function startThread(): PoolThread {
  // The thread runs TypeScript like the rest of the worker, through tsx (see its boot file).
  // A thread that registered tsx's loader keeps the process alive even when unref()'d, so the
  // pool is stopped explicitly (stopComputePool) by whoever started it.
  // A larger young generation: a run's statistics allocate many short-lived objects, and with
  // V8's default the scavenger took some 40 % of the thread's time (measured on the benchmark
  // roster's cells: 0.22 s → 0.18 s a pass with 64 MB semi-spaces).
  const worker = new Worker(new URL('./compute-thread-boot.mjs', import.meta.url), { resourceLimits: { maxYoungGenerationSizeMb: 192 } });
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

/** Terminates the compute threads (a later run starts new ones). */
export async function stopComputePool(): Promise<void> {
  const pool = threads;
  threads = null;
  if (pool) await Promise.all(pool.map((t) => t.worker.terminate()));
}

function runBatch(t: PoolThread, jobs: ComputeJob[], groups: GroupInfo[], settings: RunSettings, runId: string): Promise<JobAnswer[]> {
  const id = nextId++;
  return new Promise((resolve, reject) => {
    t.pending.set(id, { resolve, reject });
    t.worker.postMessage({ id, jobs, groups, settings, runId } satisfies BatchRequest);
  });
}

/** Called with each job's answer as soon as it is there (the run streams it into PostgreSQL meanwhile). */
export type OnPart = (job: ComputeJob, answer: JobAnswer) => void;

/**
 * A run's statistics (company-wide and per site, see compute-scopes.ts) spread over the compute
 * threads: each idle thread takes the next job, costliest first, and `onPart` sees every answer
 * as it arrives; the result joins the answers in job order, so it does not depend on the number
 * of threads or their timing. On a single core everything runs on the calling thread.
 * `ruleSites` (ruleSiteKey): the outcome × sites whose rows site-level watch rules read.
 */
export async function computeAll(
  cells: Cell[],
  outcomes: OutcomeInfo[],
  groups: GroupInfo[],
  settings: RunSettings,
  runId: string,
  onPart: OnPart = () => {},
  ruleSites: ReadonlySet<string> = new Set(),
): Promise<MergedAnswers> {
  const jobs = computeJobs(cells, outcomes, ruleSites);
  const parts: JobAnswer[] = new Array(jobs.length);
  if (COMPUTE_THREADS < 2) {
    jobs.forEach((j, i) => {
      parts[i] = answerJob(j, groups, settings, runId);
      onPart(j, parts[i]!);
    });
    return mergeAnswers(parts);
  }
  warmComputePool();
  const pool = threads!;
  await Promise.all(pool.map((t) => t.ready));
  // The company scope costs most (it adds the adjustment by site): it goes first.
  const queue = jobs.map((_, i) => i).sort((a, b) => Number(jobs[a]!.siteId !== null) - Number(jobs[b]!.siteId !== null) || a - b);
  const drain = async (t: PoolThread) => {
    for (let i = queue.shift(); i !== undefined; i = queue.shift()) {
      const [part] = await runBatch(t, [jobs[i]!], groups, settings, runId);
      parts[i] = part!;
      onPart(jobs[i]!, part!);
    }
  };
  await Promise.all(pool.map(drain));
  return mergeAnswers(parts);
}

import type { DataSource } from 'typeorm';
import { createDataSource } from '@ratewarden/db';
import { readWorkerConfig } from '@ratewarden/worker/config';
import { ageBandEdgesOf } from '@ratewarden/shared/age-bands';
import { applyAggregationSettings, CELLS_FROM_ENTRIES_SQL } from '@ratewarden/worker/runs/cells-query';
import { stopComputePool } from '@ratewarden/worker/runs/compute-pool';
import { performRun, type PerformRunOptions } from '@ratewarden/worker/runs/perform-run';
import { runSettingsOf } from '@ratewarden/worker/runs/run-settings';
import { addBenchCases, BENCH_OUTCOMES } from './bench-cases';
import { mergeLatest } from './bench-latest';
import { benchWeb, type WebBench } from './bench-web';

/** The `"run"` entry of `.data/bench/latest.json`. */
export interface RunBench {
  /** Current roster rows the run aggregated. */
  rows: number;
  /**
   * The bare SQL GROUP BY that produces the run's cells from the roster's entries (best of three
   * rounds, after a warm-up). The run itself reads the sums each intake stored (roster_sums).
   */
  groupBySeconds: number;
  /** The whole run: the same aggregation, the statistics for every cell, storing the result set, rules (best of three rounds side by side with the GROUP BY, after a warm-up run). */
  runSeconds: number;
  ratio: number;
}

const round3 = (x: number) => Math.round(x * 1000) / 1000;

/** The run settings a worker with the default configuration records. */
export const benchRunSettings = () => runSettingsOf(readWorkerConfig({}));

/**
 * One whole run (trigger "bench") as the worker makes it, timed from the call to its return; the
 * statistics threads are kept for the next run, as a long-lived worker keeps them (the caller
 * stops them with stopComputePool()). Throws unless the run succeeds.
 */
export async function timedBenchRun(
  ds: DataSource,
  reason: string,
  options: Partial<PerformRunOptions> = {},
): Promise<{ seconds: number; results: number; runId: string }> {
  const t = performance.now();
  const outcome = await performRun(ds, {
    trigger: 'bench',
    reason,
    settings: benchRunSettings(),
    appUrl: 'http://127.0.0.1:3000/',
    waitForLockMs: 10 * 60_000,
    keepComputeThreads: true,
    ...options,
  });
  if (outcome.status !== 'succeeded') throw new Error(`the benchmark run did not succeed: ${outcome.status === 'failed' ? outcome.error : outcome.reason}`);
  return { seconds: (performance.now() - t) / 1000, results: outcome.resultCount, runId: outcome.runId };
}

/**
 * The run benchmark: on a database holding the generated roster and its cases, times the bare
 * GROUP BY of the run's cells and then a whole run (trigger "bench"), and returns both with their
 * ratio (target: a run within 1.2 × the GROUP BY). The caller (scripts/bench.ts) generates the
 * data beforehand and writes the result under `"run"` in `.data/bench/latest.json`.
 */
export async function benchRun(databaseUrl: string, log: (line: string) => void = () => {}): Promise<RunBench> {
  const ds = createDataSource(databaseUrl, 3);
  await ds.initialize();
  try {
    const settings = benchRunSettings();
    const [count] = (await ds.query(
      `SELECT count(*)::int AS n FROM roster_entries r JOIN roster_slices s ON s.intake_id = r.intake_id AND s.site_id = r.site_id AND s.month = r.month`,
    )) as Array<{ n: number }>;
    // The same session settings as the run's snapshot transaction, so that only the work differs.
    const timeGroupBy = () =>
      ds.transaction(async (em) => {
        await applyAggregationSettings(em);
        const t = performance.now();
        await em.query(CELLS_FROM_ENTRIES_SQL, [settings.countedStatuses, ageBandEdgesOf(settings)]);
        return (performance.now() - t) / 1000;
      });
    const timeRun = (reason: string) => timedBenchRun(ds, reason);
    // Warm-up of both sides: a warm cache for the GROUP BY, and for the run the loading and
    // optimising of the statistics code, which a long-lived worker pays once.
    await timeGroupBy();
    const cold = await timeRun('npm run bench (warm-up)');
    log(`run bench: first run in this process ${cold.seconds.toFixed(2)} s`);
    // Then three rounds side by side, GROUP BY and run in turn, so that a noisy moment of this
    // shared machine falls on both; each side's best round is compared.
    const groupByRounds: number[] = [];
    const runRounds: Array<Awaited<ReturnType<typeof timeRun>>> = [];
    for (let round = 1; round <= 3; round++) {
      groupByRounds.push(await timeGroupBy());
      runRounds.push(await timeRun(`npm run bench (round ${round})`));
    }
    const groupBySeconds = Math.min(...groupByRounds);
    const best = runRounds.reduce((a, b) => (b.seconds < a.seconds ? b : a));
    const runSeconds = best.seconds;
    log(`run bench: bare GROUP BY of the cells ${groupByRounds.map((x) => x.toFixed(2)).join(' / ')} s over ${count!.n} roster rows`);
    log(`run bench: whole run ${runRounds.map((r) => r.seconds.toFixed(2)).join(' / ')} s (${best.results} results)`);
    const [summary] = (await ds.query(`SELECT summary FROM runs WHERE id = $1`, [best.runId])) as Array<{ summary: { seconds?: Record<string, number> } }>;
    log(`run bench: parts of the best run (s) ${JSON.stringify(summary?.summary.seconds ?? {})}`);
    log(`run bench: best of three, ratio ${(runSeconds / groupBySeconds).toFixed(2)}`);
    return { rows: count!.n, groupBySeconds: round3(groupBySeconds), runSeconds: round3(runSeconds), ratio: round3(runSeconds / groupBySeconds) };
  } finally {
    await stopComputePool();
    await ds.destroy();
  }
}

/**
 * The run and web sections of `npm run bench`, after the intake section applied the roster: the
 * roster's case list (bench-cases.ts), the run benchmark, the web bundle sizes; merged into
 * `.data/bench/latest.json` under "run" and "web" (re-read first: other sections write there).
 */
export async function benchRunAndWeb(root: string, databaseUrl: string, say: (line: string) => void): Promise<{ run: RunBench; web: WebBench }> {
  const { cases } = await addBenchCases(databaseUrl);
  say(`run bench: ${cases.toLocaleString('en')} generated cases over ${BENCH_OUTCOMES.length} outcomes`);
  const run = await benchRun(databaseUrl, say);
  const web = benchWeb(root);
  say(`web: initial JavaScript ${web.initialJsGzipKb} KiB gzip, all JavaScript ${web.totalJsGzipKb} KiB gzip`);
  say(`run and web figures written to ${mergeLatest(root, { run, web })}`);
  return { run, web };
}

import { spawnSync } from 'node:child_process';
import { createReadStream, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { pipeline } from 'node:stream/promises';
import pg from 'pg';
import { from as copyFrom } from 'pg-copy-streams';
import { createDataSource, migrate } from '@ratewarden/db';
import { stopComputePool } from '@ratewarden/worker/runs/compute-pool';
import { BENCH_OUTCOMES, insertBenchOutcomes } from './bench-cases';
import { applySeconds, startIntakeChild, uploadSeconds } from './bench-intake';
import { insertBenchSitesAndGroups } from './bench-roster';
import { benchRunSettings, timedBenchRun } from './bench-run';
import { recreateDatabase } from './postgres';
import { DEBIAN_PYTHON, ensureSystemPackages } from './system-packages';

/** The `"endToEnd"` entry of `.data/bench/latest.json` (seconds; each side's best round). */
export interface EndToEndBench {
  rosterRows: number;
  cases: number;
  /** The whole path a user waits for, best round: roster check + apply, case list check + apply, the run. */
  seconds: number;
  /** Of that round: roster and case list uploaded to checked. */
  checkSeconds: number;
  /** Of that round: roster and case list applied. */
  applySeconds: number;
  /** Of that round: the run (the first after the bulk load, planner statistics refreshed inside it). */
  runSeconds: number;
  /** The roster's apply alone, best round. */
  rosterApplySeconds: number;
  /** COPY of the roster file into a table with roster_entries' primary key and indexes, best round. */
  bareCopyKeyedSeconds: number;
  /** pandas reading both files and writing the run's cells, the whole python3 process, best round. */
  pandasSeconds: number;
  ratioToPandas: number;
  /** rosterApplySeconds / bareCopyKeyedSeconds. */
  applyToKeyedCopy: number;
  /** pandas' cells against the run's stored cells, compared in every round (the round with most differences): all equal when `differing` is 0. */
  cellsCompared: { runCells: number; pandasCells: number; differing: number };
  rounds: Array<{
    seconds: number;
    checkSeconds: number;
    applySeconds: number;
    runSeconds: number;
    rosterApplySeconds: number;
    bareCopyKeyedSeconds: number;
    pandasSeconds: number;
  }>;
}

const PANDAS_SCRIPT = join(import.meta.dirname, 'bench-pandas-cells.py');
const E2E_DATABASE = 'ratewarden_bench_e2e';
const round3 = (x: number) => Math.round(x * 1000) / 1000;
const since = (t: bigint) => Number(process.hrtime.bigint() - t) / 1e9;

/** Debian's pandas for the baseline, installed like the test tools (apt-get when root, else a clear message). */
export function ensurePandas(): void {
  ensureSystemPackages([
    {
      pkg: 'python3-pandas',
      present: () => spawnSync(DEBIAN_PYTHON, ['-c', 'import pandas'], { stdio: 'ignore' }).status === 0,
      why: 'the pandas baseline of the end-to-end benchmark',
    },
  ]);
}

/**
 * (a) The roster file COPYed into a table keyed as roster_entries is (db/src/migrations/
 * 1764633700000-CohortData.ts): primary key (intake_id, worker, month), an index on
 * (intake_id, site, month) and one on (worker, month); hours and birth year typed as stored. The
 * file's own columns stand in for the ids (worker_key for worker_id, the site code for site_id,
 * the month as its 'YYYY-MM' text, which PostgreSQL does not read as a date), in the "C"
 * collation, which compares bytes as integer keys compare; intake_id is one constant.
 */
export async function bareKeyedCopySeconds(url: string, file: string): Promise<number> {
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  try {
    await client.query(`DROP TABLE IF EXISTS bench_keyed`);
    await client.query(`
      CREATE TABLE bench_keyed (
        intake_id uuid NOT NULL DEFAULT '00000000-0000-4000-8000-000000000001',
        worker_key text COLLATE "C" NOT NULL, site text COLLATE "C" NOT NULL, exposure_group text NOT NULL, month text COLLATE "C" NOT NULL,
        hours numeric(7, 2) NOT NULL, birth_year integer NOT NULL, sex text NOT NULL, job_title text,
        PRIMARY KEY (intake_id, worker_key, month)
      )`);
    await client.query(`CREATE INDEX bench_keyed_slice ON bench_keyed (intake_id, site, month)`);
    await client.query(`CREATE INDEX bench_keyed_worker ON bench_keyed (worker_key, month)`);
    const t = process.hrtime.bigint();
    await pipeline(
      createReadStream(file, { highWaterMark: 256 * 1024 }),
      client.query(
        copyFrom(`COPY bench_keyed (worker_key, site, exposure_group, month, hours, birth_year, sex, job_title) FROM STDIN WITH (FORMAT csv, HEADER true)`),
      ),
    );
    const seconds = since(t);
    await client.query(`DROP TABLE bench_keyed`);
    return seconds;
  } finally {
    await client.end();
  }
}

/** (b) pandas: the whole python3 process, from start to the cells written (bench-pandas-cells.py). */
export function pandasSeconds(rosterFile: string, casesFile: string, outFile: string): { seconds: number; parts: Record<string, number> } {
  const outcomes = BENCH_OUTCOMES.map((o) => ({ code: o.code, lag: o.lag, firstOnly: o.rule === 'first_event' }));
  const t = process.hrtime.bigint();
  const r = spawnSync(DEBIAN_PYTHON, [PANDAS_SCRIPT, rosterFile, casesFile, outFile, JSON.stringify(outcomes), benchRunSettings().countedStatuses.join(',')], {
    encoding: 'utf8',
  });
  const seconds = since(t);
  if (r.status !== 0) throw new Error(`the pandas baseline failed: ${r.stderr || r.error}`);
  return { seconds, parts: JSON.parse(r.stdout.trim().split('\n').at(-1)!) as Record<string, number> };
}

/** The run's stored cells as pandas writes them (codes, not ids), keyed by everything but the figures. */
async function runCells(url: string, runId: string): Promise<Map<string, string>> {
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  try {
    const { rows } = await client.query<{ key: string; value: string }>(
      `SELECT concat_ws(',', o.code, to_char(c.month, 'YYYY-MM'), s.code, g.code, c.age_band, c.sex) AS key, c.hours::text || ',' || c.cases AS value
       FROM run_cells rc
       CROSS JOIN LATERAL unnest(rc.months, rc.site_ids, rc.age_bands, rc.sexes, rc.hours, rc.cases) AS c(month, site_id, age_band, sex, hours, cases)
       JOIN outcomes o ON o.id = rc.outcome_id JOIN exposure_groups g ON g.id = rc.exposure_group_id JOIN sites s ON s.id = c.site_id
       WHERE rc.run_id = $1`,
      [runId],
    );
    return new Map(rows.map((r) => [r.key, r.value]));
  } finally {
    await client.end();
  }
}

function pandasCells(file: string): Map<string, string> {
  const lines = readFileSync(file, 'utf8').trim().split('\n').slice(1);
  return new Map(
    lines.map((line) => {
      const f = line.split(',');
      return [f.slice(0, 6).join(','), f.slice(6).join(',')];
    }),
  );
}

function compareCells(run: Map<string, string>, pandas: Map<string, string>): EndToEndBench['cellsCompared'] {
  let differing = 0;
  for (const [key, value] of run) if (pandas.get(key) !== value) differing++;
  for (const key of pandas.keys()) if (!run.has(key)) differing++;
  return { runCells: run.size, pandasCells: pandas.size, differing };
}

/** A fresh database holding only the benchmark's sites, groups and outcomes. */
async function freshDatabase(port: number, url: string): Promise<void> {
  await recreateDatabase(port, E2E_DATABASE);
  await migrate(url);
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  try {
    await insertBenchSitesAndGroups(client);
    await insertBenchOutcomes(client);
  } finally {
    await client.end();
  }
}

/**
 * The whole path a user waits for, upload to results, on a fresh database each round: the roster
 * checked and applied through the intake route, the case list checked and applied, then the run
 * (as the worker makes it once the intake's run request is due; the quiet interval that batches
 * requests, RUN_QUIET_SECONDS, is not counted). Side by side in each round: (a) a bare COPY of
 * the roster into a table keyed as roster_entries and (b) pandas computing the run's cells from
 * both files; the cells pandas wrote are compared with the run's stored cells. Each side's best
 * round is reported, as the other sections do.
 */
export async function benchEndToEnd(opts: {
  root: string;
  port: number;
  rosterFile: string;
  rosterRows: number;
  casesFile: string;
  cases: number;
  rounds: number;
  say: (line: string) => void;
}): Promise<EndToEndBench> {
  const { root, port, rosterFile, casesFile, say } = opts;
  ensurePandas();
  const url = `postgres://ratewarden@127.0.0.1:${port}/${E2E_DATABASE}`;
  const cellsFile = join(root, '.data', 'bench', 'pandas-cells.csv');
  const rounds: EndToEndBench['rounds'] = [];
  let cellsCompared: EndToEndBench['cellsCompared'] | undefined;
  try {
    for (let round = 1; round <= opts.rounds; round++) {
      await freshDatabase(port, url);
      const keyed = await bareKeyedCopySeconds(url, rosterFile);
      const pandas = pandasSeconds(rosterFile, casesFile, cellsFile);
      const child = await startIntakeChild(root, url);
      const ds = createDataSource(url, 3);
      await ds.initialize();
      try {
        const rosterCheck = await uploadSeconds(child.port, rosterFile, 'check');
        if (rosterCheck.status !== 201) throw new Error(`roster check answered ${rosterCheck.status}: ${JSON.stringify(rosterCheck.body).slice(0, 400)}`);
        const rosterApply = await applySeconds(child.port, rosterCheck.body.intake.id);
        if (rosterApply.status !== 200) throw new Error(`roster apply answered ${rosterApply.status}: ${JSON.stringify(rosterApply.body).slice(0, 400)}`);
        const casesCheck = await uploadSeconds(child.port, casesFile, 'check', { kind: 'cases' });
        if (casesCheck.status !== 201) throw new Error(`case list check answered ${casesCheck.status}: ${JSON.stringify(casesCheck.body).slice(0, 400)}`);
        const casesApply = await applySeconds(child.port, casesCheck.body.intake.id);
        if (casesApply.status !== 200) throw new Error(`case list apply answered ${casesApply.status}: ${JSON.stringify(casesApply.body).slice(0, 400)}`);
        const run = await timedBenchRun(ds, `npm run bench, end to end (round ${round})`);
        const r = {
          checkSeconds: rosterCheck.seconds + casesCheck.seconds,
          applySeconds: rosterApply.seconds + casesApply.seconds,
          runSeconds: run.seconds,
          rosterApplySeconds: rosterApply.seconds,
          bareCopyKeyedSeconds: keyed,
          pandasSeconds: pandas.seconds,
        };
        rounds.push({ seconds: r.checkSeconds + r.applySeconds + r.runSeconds, ...r });
        const compared = compareCells(await runCells(url, run.runId), pandasCells(cellsFile));
        if (!cellsCompared || compared.differing >= cellsCompared.differing) cellsCompared = compared;
        say(
          `end to end, round ${round}: roster check ${rosterCheck.seconds.toFixed(2)} s + apply ${rosterApply.seconds.toFixed(2)} s, ` +
            `case list check ${casesCheck.seconds.toFixed(2)} s + apply ${casesApply.seconds.toFixed(2)} s, run ${run.seconds.toFixed(2)} s ` +
            `= ${rounds.at(-1)!.seconds.toFixed(2)} s; keyed COPY ${keyed.toFixed(2)} s; pandas ${pandas.seconds.toFixed(2)} s ${JSON.stringify(pandas.parts)}; ` +
            `cells: run ${compared.runCells}, pandas ${compared.pandasCells}, differing ${compared.differing}`,
        );
      } finally {
        child.stop();
        await ds.destroy();
      }
    }
  } finally {
    await stopComputePool();
  }
  const best = rounds.reduce((a, b) => (b.seconds < a.seconds ? b : a));
  const min = (k: keyof (typeof rounds)[number]) => Math.min(...rounds.map((r) => r[k]));
  const rosterApply = min('rosterApplySeconds');
  const keyed = min('bareCopyKeyedSeconds');
  const pandas = min('pandasSeconds');
  return {
    rosterRows: opts.rosterRows,
    cases: opts.cases,
    seconds: round3(best.seconds),
    checkSeconds: round3(best.checkSeconds),
    applySeconds: round3(best.applySeconds),
    runSeconds: round3(best.runSeconds),
    rosterApplySeconds: round3(rosterApply),
    bareCopyKeyedSeconds: round3(keyed),
    pandasSeconds: round3(pandas),
    ratioToPandas: round3(best.seconds / pandas),
    applyToKeyedCopy: round3(rosterApply / keyed),
    cellsCompared: cellsCompared!,
    rounds: rounds.map((r) => Object.fromEntries(Object.entries(r).map(([k, v]) => [k, round3(v)])) as (typeof rounds)[number]),
  };
}

import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import pg from 'pg';
import { migrate } from '@ratewarden/db';
import { writeBenchCasesCsv } from './lib/bench-cases';
import { benchEndToEnd } from './lib/bench-end-to-end';
import { applySeconds, bareCopySeconds, discardIntake, peakRss, startIntakeChild, uploadSeconds } from './lib/bench-intake';
import { mergeLatest } from './lib/bench-latest';
import { benchReads } from './lib/bench-reads';
import { insertBenchSitesAndGroups, writeBenchRoster } from './lib/bench-roster';
import { benchRunAndWeb } from './lib/bench-run';
import { readBenchSettings } from './lib/bench-settings';
import { runMain, say } from './lib/log';
import { recreateDatabase, startPostgres } from './lib/postgres';

const root = join(import.meta.dirname, '..');
const WORKERS = 20_000;
const MONTHS = 60;

/**
 * `npm run bench`: its own PostgreSQL and database, a 1.2 M-row roster CSV, then side by side
 * (a) a bare COPY of the file and (b) Ratewarden's intake of it through the real HTTP route,
 * checks included; peak memory of the intake process. Then the run benchmark on that roster with
 * generated cases (scripts/lib/bench-run.ts) and the web bundle sizes; the read routes under load
 * through the real API, also during an apply (bench-reads.ts); and the whole path from upload to
 * results beside a keyed COPY and pandas (bench-end-to-end.ts). Figures go to
 * .data/bench/latest.json, merged with what other sections wrote there. BENCH_SECTIONS picks sections.
 */
runMain(async () => {
  const settings = readBenchSettings();
  const PGPORT = settings.BENCH_PGPORT;
  const outDir = join(root, '.data', 'bench');
  mkdirSync(outDir, { recursive: true });
  const db = await startPostgres({ folder: join(root, '.data', 'bench-postgres'), port: PGPORT, database: 'ratewarden_bench', durable: false });
  process.on('exit', () => db.stop());
  await recreateDatabase(PGPORT, 'ratewarden_bench');
  await migrate(db.url);
  const client = new pg.Client({ connectionString: db.url });
  await client.connect();
  await insertBenchSitesAndGroups(client);
  await client.end();

  const file = join(outDir, 'roster-1200k.csv');
  say(`writing the benchmark roster (${WORKERS} workers × ${MONTHS} months) to ${file} ...`);
  const { rows, bytes } = await writeBenchRoster(file, WORKERS, MONTHS);
  say(`${rows.toLocaleString('en')} rows, ${(bytes / 1024 ** 2).toFixed(0)} MiB`);

  // A warm-up COPY brings the file into the page cache, so both measurements read it alike.
  await bareCopySeconds(db.url, file);
  const child = await startIntakeChild(root, db.url);
  try {
    // Three rounds side by side, bare COPY and intake in turn, so that a noisy moment of this shared
    // machine falls on both; each side's best round is compared. Between rounds the checked intake
    // is discarded, or the checksum guard would answer the same file as a duplicate.
    const copyRounds: number[] = [];
    const checkRounds: number[] = [];
    let check: Awaited<ReturnType<typeof uploadSeconds>> | undefined;
    for (let round = 1; round <= 3; round++) {
      if (check) {
        const discarded = await discardIntake(child.port, check.body.intake.id);
        if (discarded !== 200) throw new Error(`discarding the round's intake answered ${discarded}`);
      }
      copyRounds.push(await bareCopySeconds(db.url, file));
      check = await uploadSeconds(child.port, file, 'check');
      if (check.status !== 201) throw new Error(`intake answered ${check.status}: ${JSON.stringify(check.body).slice(0, 400)}`);
      checkRounds.push(check.seconds);
    }
    const copySeconds = Math.min(...copyRounds);
    const intakeSeconds = Math.min(...checkRounds);
    say(
      `bare COPY:       ${copyRounds.map((x) => x.toFixed(2)).join(' / ')} s, best ${copySeconds.toFixed(2)} s  (${Math.round(rows / copySeconds).toLocaleString('en')} rows/s)`,
    );
    say(
      `intake (check):  ${checkRounds.map((x) => x.toFixed(2)).join(' / ')} s, best ${intakeSeconds.toFixed(2)} s  (${Math.round(rows / intakeSeconds).toLocaleString('en')} rows/s), ratio ${(intakeSeconds / copySeconds).toFixed(2)}×`,
    );
    if (!check) throw new Error('no intake round ran');
    const apply = await applySeconds(child.port, check.body.intake.id);
    if (apply.status !== 200) throw new Error(`apply answered ${apply.status}`);
    say(`apply (re-check + store 1.2 M entries): ${apply.seconds.toFixed(2)} s`);
    const peakRssMb = Math.round(await peakRss(child.port));
    say(`peak RSS of the intake process: ${peakRssMb} MB`);

    const intake = {
      rows,
      copySeconds: round(copySeconds),
      intakeSeconds: round(intakeSeconds),
      ratio: round(intakeSeconds / copySeconds),
      peakRssMb,
      applySeconds: round(apply.seconds),
      fileMb: Math.round(bytes / 1024 ** 2),
    };
    say(`figures written to ${mergeLatest(root, { intake })}`);
  } finally {
    child.stop();
  }
  if (!settings.sections.has('run')) return;

  // The run section (cases for the applied roster, then the run against its bare GROUP BY) and the web bundle.
  await benchRunAndWeb(root, db.url, say);
  const casesFile = join(outDir, 'cases-1200k.csv');
  const { cases } = await writeBenchCasesCsv(db.url, casesFile);

  if (settings.sections.has('reads')) {
    const { reads, readsBeside, readsDuringApply } = await benchReads({
      root,
      databaseUrl: db.url,
      connections: settings.BENCH_READS_CONNECTIONS,
      seconds: settings.BENCH_READS_SECONDS,
      beside: settings.BENCH_READS_BESIDE,
      say,
    });
    // `reads` is keyed by route label only; its measurement time is readsDuringApply's.
    mergeLatest(root, readsBeside ? { reads, readsBeside } : { reads }, false);
    say(`read figures written to ${mergeLatest(root, { readsDuringApply })}`);
  }
  if (settings.sections.has('endToEnd')) {
    const endToEnd = await benchEndToEnd({
      root,
      port: PGPORT,
      rosterFile: file,
      rosterRows: rows,
      casesFile,
      cases,
      rounds: settings.BENCH_END_TO_END_ROUNDS,
      say,
    });
    say(
      `end to end, best round: ${endToEnd.seconds} s (check ${endToEnd.checkSeconds} s, apply ${endToEnd.applySeconds} s, run ${endToEnd.runSeconds} s); ` +
        `keyed COPY ${endToEnd.bareCopyKeyedSeconds} s, roster apply ${endToEnd.applyToKeyedCopy}× it; pandas ${endToEnd.pandasSeconds} s, the path ${endToEnd.ratioToPandas}× it`,
    );
    say(`end-to-end figures written to ${mergeLatest(root, { endToEnd })}`);
  }
});

const round = (x: number) => Math.round(x * 100) / 100;

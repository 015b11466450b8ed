import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource, QueryRunner } from 'typeorm';
import { createApp } from '@ratewarden/api/app';
import { createRule } from '@ratewarden/api/features/rules/rules-service';
import { watchRuleInputSchema } from '@ratewarden/shared/rules';
import { performRun } from '@ratewarden/worker/runs/perform-run';
import { clearCohortData, currentRunId, makeCohort, settings, type Cohort } from '../integration/runs-fixture';
import { provisionUser, signIn, type SignedInAgent } from '../support/sign-in';
import { testApiConfig } from '../support/test-config';
import { allSiteIds, openTestDataSource, testDatabaseUrl } from '../support/test-db';
import { cohortTables, resultTables, tableChecksums } from './support-checksums';
import { killHard, startChild, until, type Child } from './support-processes';

const APP_NAME = 'ratewarden-worker-killed';

/**
 * Where the worker is killed during a run. Each point is held by a lock this test takes, so the
 * run waits there inside its work and the kill lands mid-run; a lock on `run_requests`, which the
 * run's final transaction updates last, is held throughout, so no kill can come after the commit.
 */
const killPoints = [
  // The aggregation's text in pg_stat_activity is cut off before it names roster_entries.
  { name: 'while reading the cohort', hold: `LOCK TABLE roster_entries IN ACCESS EXCLUSIVE MODE`, running: 'counted AS' },
  { name: 'storing the cells', hold: `LOCK TABLE run_cells IN SHARE MODE`, running: 'COPY run_cells' },
  { name: 'storing the results', hold: `LOCK TABLE run_results IN SHARE MODE`, running: 'COPY run_results' },
  { name: 'at the switch to the new results', hold: `LOCK TABLE current_run IN SHARE MODE`, running: 'INSERT INTO current_run' },
] as const;

describe('kill -9 of the worker mid-run', () => {
  let ds: DataSource;
  let c: Cohort;
  let physician: SignedInAgent;
  let worker: Child | null = null;

  const startWorker = () =>
    startChild('worker/src/main.ts', {
      DATABASE_URL: `${testDatabaseUrl()}?application_name=${APP_NAME}`,
      RUN_POLL_MS: '100',
      NOTICE_POLL_MS: '600000',
      SMTP_PORT: '9',
    });
  const backends = async () =>
    (await ds.query(`SELECT state, wait_event_type, query FROM pg_stat_activity WHERE application_name = $1`, [APP_NAME])) as Array<{
      state: string;
      wait_event_type: string | null;
      query: string;
    }>;
  const served = async (runId: string) => {
    const current = await physician.agent.get('/api/runs/current').expect(200);
    const results = await physician.agent.get(`/api/runs/${runId}/results?outcomeId=${c.outcomes.NOISE}&window=month`).expect(200);
    return { current: (current.body as { id: string }).id, results: (results.body as unknown[]).length };
  };

  beforeAll(async () => {
    ds = await openTestDataSource();
    await clearCohortData(ds);
    c = await makeCohort(ds, {
      groups: [
        ['REF', 0],
        ['LOW', 1],
        ['HIGH', 2],
      ],
      reference: 'REF',
      outcomes: [
        ['NOISE', 'recurrent'],
        ['SKIN', 'first_event', 3],
      ],
    });
    // 1,500 workers over 24 months at both sites: 36,000 roster rows, cases rising with the exposure level.
    const groups = [c.groups.REF!, c.groups.LOW!, c.groups.HIGH!];
    const rows: Array<[number, string, number, number, number]> = [];
    const cases: Array<[number, number, string]> = [];
    for (let i = 0; i < 1_500; i++) {
      const w = await c.worker(`k${i}`, 1960 + (i % 40), i % 2 ? 'F' : 'M');
      const level = i % 3;
      for (let m = 0; m < 24; m++) {
        const month = `${2030 + Math.floor(m / 12)}-${String((m % 12) + 1).padStart(2, '0')}-01`;
        rows.push([w, month, c.sites[i % 2]!, groups[level]!, 140 + (i % 20)]);
        if ((i * 31 + m * 7) % (60 - level * 20) === 0) cases.push([w, c.outcomes.NOISE!, month.replace(/01$/, '10')]);
      }
      if (i % 50 === level) cases.push([w, c.outcomes.SKIN!, '2030-06-15']);
    }
    await c.roster(rows);
    await c.cases(cases);
    await createRule(
      ds,
      { kind: 'client', clientId: 'kill-tests' },
      watchRuleInputSchema.parse({
        name: 'Noise rate above 1 per 1,000 person-years',
        outcomeId: c.outcomes.NOISE,
        exposureGroupId: c.groups.HIGH,
        measure: 'rate',
        thresholdOn: 'estimate',
        threshold: 1,
        minCases: 5,
        window: 'month',
        fdrControl: false,
        recipients: [],
      }),
    );
    await provisionUser(ds, 'physician@demo.ratewarden.test', 'physician', await allSiteIds(ds));
    physician = await signIn(createApp({ dataSource: ds, config: testApiConfig() }), 'physician@demo.ratewarden.test');
  });
  afterEach(async () => {
    if (worker) await killHard(worker.process);
    worker = null;
  });
  afterAll(async () => {
    await ds.destroy();
  });

  it('keeps the previous results current and served at every kill point, and the next run succeeds', async () => {
    const first = await performRun(ds, { trigger: 'cli', settings, appUrl: 'x' });
    expect(first.status).toBe('succeeded');
    const previous = (first as { runId: string }).runId;
    const [{ n: flagCount }] = (await ds.query(`SELECT count(*)::int AS n FROM flags`)) as Array<{ n: number }>;
    expect(flagCount).toBeGreaterThan(0);
    const servedBefore = await served(previous);
    expect(servedBefore).toMatchObject({ current: previous });
    expect(servedBefore.results).toBeGreaterThan(0);
    // The workers' notice senders would try (and fail) to deliver the flag's notices: not this test's subject.
    await ds.query(`UPDATE notices SET next_attempt_at = now() + interval '1 day'`);
    // run_requests gains a picked request per run; everything else a run writes must stay as it was.
    const stable = [...cohortTables.filter((t) => t !== 'run_requests'), ...resultTables];
    const before = await tableChecksums(ds, stable);

    let kills = 0;
    let survived = 0;
    const killedRuns: string[] = [];
    for (const point of killPoints) {
      await ds.query(`INSERT INTO run_requests (reason) VALUES ($1)`, [`kill ${point.name}`]);
      const holder: QueryRunner = ds.createQueryRunner();
      await holder.connect();
      await holder.startTransaction();
      await holder.query(`LOCK TABLE run_requests IN SHARE MODE`);
      await holder.query(point.hold);
      worker = startWorker();
      const runId = await until(
        `the run to reach ${point.name}`,
        async () => {
          const waiting = (await backends()).some((b) => b.wait_event_type === 'Lock' && b.query.includes(point.running));
          const rows = (await ds.query(`SELECT id FROM runs WHERE state = 'running' AND worker LIKE '%:' || $1`, [String(worker!.process.pid)])) as Array<{
            id: string;
          }>;
          return waiting && rows[0]?.id;
        },
        30_000,
      ).catch(async (err: Error) => {
        throw new Error(`${err.message}; the worker's connections: ${JSON.stringify(await backends())}; its output: ${worker!.output()}`);
      });
      await killHard(worker.process);
      worker = null;
      kills++;
      killedRuns.push(runId);
      await holder.rollbackTransaction();
      await holder.release();
      await until("the killed worker's connections to close", async () => (await backends()).length === 0);

      expect(await currentRunId(ds), `current run after the kill ${point.name}`).toBe(previous);
      expect(await tableChecksums(ds, stable), `store after the kill ${point.name}`).toEqual(before);
      expect(await served(previous), `served after the kill ${point.name}`).toEqual(servedBefore);
      survived++;
    }

    // A worker left alone runs the requests the killed ones picked up, and the new results go live.
    worker = startWorker();
    const next = await until('the next run to succeed', async () => {
      const rows = (await ds.query(`SELECT id FROM runs WHERE state = 'succeeded' AND worker LIKE '%:' || $1`, [String(worker!.process.pid)])) as Array<{
        id: string;
      }>;
      return rows[0]?.id;
    });
    expect(await currentRunId(ds)).toBe(next);
    expect((await served(next)).current).toBe(next);
    expect((await served(next)).results).toBe(servedBefore.results);
    const stale = (await ds.query(`SELECT DISTINCT state, error FROM runs WHERE id = ANY($1::uuid[])`, [killedRuns])) as Array<{
      state: string;
      error: string;
    }>;
    expect(stale).toEqual([{ state: 'failed', error: expect.stringMatching(/interrupted/) }]);
    expect((await ds.query(`SELECT count(*)::int AS n FROM run_requests WHERE picked_at IS NULL`)) as unknown).toEqual([{ n: 0 }]);
    console.log(
      `reliability: kill -9 of the worker mid-run: ${kills} kills (${killPoints.map((p) => p.name).join(', ')}), ${survived} left the previous run current and served with its store unchanged; the next run succeeded`,
    );
  });
});

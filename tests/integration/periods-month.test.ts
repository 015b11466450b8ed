import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createApp } from '@ratewarden/api/app';
import { pendingRunSchema, runDetailSchema, runResultSchema, type RunResult } from '@ratewarden/shared/runs';
import { performRun } from '@ratewarden/worker/runs/perform-run';
import { runIfRequested } from '@ratewarden/worker/runs/request-poller';
import { testApiConfig } from '../support/test-config';
import { provisionUser, signIn } from '../support/sign-in';
import { allSiteIds, openTestDataSource } from '../support/test-db';
import { monthCohort, NEW_MONTH, type MonthCohort } from './periods-fixture';
import { clearCohortData, settings } from './runs-fixture';

const APP_URL = 'http://127.0.0.1:3000/';
const QUIET = 120;
const seconds = (d: Date, s: number) => new Date(d.getTime() + s * 1000);

/**
 * Issue 12's month, played through the API: the roster of the new month arrives first, its case
 * list a minute later. Runs are batched (one run after both, with the worker's quiet interval on a
 * clock the test moves), watch rules see complete periods only (no flag and no notice from the
 * roster-only month), and a run made between the two marks that month partial in its results.
 */
// Each test builds a year of history through the API: slow on a busy machine, so it gets three minutes.
describe('the month of issue 12: roster first, case list a minute later', { timeout: 180_000 }, () => {
  let ds: DataSource;
  let app: ReturnType<typeof createApp>;
  let c: MonthCohort;

  const get = (path: string) =>
    c.hygienist.agent
      .get(path)
      .expect(200)
      .then((r) => r.body as unknown);
  const runCount = async () => Number(((await ds.query(`SELECT count(*) AS n FROM runs`)) as Array<{ n: string }>)[0]!.n);
  const flagsAndNotices = async () => ({
    flags: (await ds.query(`SELECT to_char(period, 'YYYY-MM') AS period, state FROM flags`)) as Array<{ period: string; state: string }>,
    notices: Number(((await ds.query(`SELECT count(*) AS n FROM notices`)) as Array<{ n: string }>)[0]!.n),
  });
  const latestRequestAt = async () =>
    ((await ds.query(`SELECT max(requested_at) AS at FROM run_requests WHERE picked_at IS NULL`)) as Array<{ at: Date }>)[0]!.at;
  /** The company's rolling-12 results of the current run, by "group|period". */
  const companyResults = async (): Promise<Map<string, RunResult>> => {
    const run = runDetailSchema.parse(await get('/api/runs/current'));
    const rows = runResultSchema.array().parse(await get(`/api/runs/${run.id}/results?outcomeId=${c.outcome}&window=rolling12`));
    return new Map(rows.map((r) => [`${r.exposureGroupId}|${r.period.slice(0, 7)}`, r]));
  };

  beforeAll(async () => {
    ds = await openTestDataSource();
    app = createApp({ dataSource: ds, config: testApiConfig({ RUN_QUIET_SECONDS: String(QUIET) }) });
  });
  afterAll(async () => {
    await ds?.destroy();
  });

  beforeEach(async () => {
    await clearCohortData(ds);
    c = await monthCohort(ds, app);
    const rule = await c.hygienist.agent
      .post('/api/rules')
      .set('x-csrf-token', c.hygienist.csrf)
      .send({
        name: `IRR over 1.5 ${c.tag}`,
        outcomeId: c.outcome,
        exposureGroupId: c.groups.exp,
        measure: 'irr',
        thresholdOn: 'estimate',
        threshold: 1.5,
        minCases: 5,
        window: 'rolling12',
        fdrControl: false,
        recipients: ['site-lead@test.invalid'],
      });
    expect(rule.status, JSON.stringify(rule.body)).toBe(201);
    // The history's run: twelve complete months, IRR 1.25, no flag.
    expect(await runIfRequested(ds, settings, APP_URL, { quietSeconds: QUIET, now: seconds(await latestRequestAt(), QUIET + 1) })).toMatchObject({
      status: 'succeeded',
    });
    expect(await flagsAndNotices()).toEqual({ flags: [], notices: 0 });
  }, 180_000);

  it('runs once after both uploads: the quiet interval starts again with the case list', async () => {
    expect(await runCount()).toBe(1);
    await c.newMonthRoster();
    const rosterAt = await latestRequestAt();
    const waiting = pendingRunSchema.parse(await get('/api/runs/pending'));
    expect(waiting.pending).toMatchObject({ count: 1, immediate: false });
    expect(new Date(waiting.pending!.dueAt).getTime()).toBe(seconds(rosterAt, QUIET).getTime());
    // A minute after the roster the worker still waits.
    expect(await runIfRequested(ds, settings, APP_URL, { quietSeconds: QUIET, now: seconds(rosterAt, 60) })).toBeNull();

    // A minute passes: the roster's request is dated a minute before the case list's.
    await ds.query(`UPDATE run_requests SET requested_at = requested_at - interval '60 seconds' WHERE picked_at IS NULL`);
    await c.newMonthCases();
    const casesAt = await latestRequestAt();
    // 100 s after the case list the roster's request is 160 s old and would be due alone; the case list moved the run on.
    expect(await runIfRequested(ds, settings, APP_URL, { quietSeconds: QUIET, now: seconds(casesAt, 100) })).toBeNull();
    // (The clock the database keeps has microseconds, a JavaScript date milliseconds: one second past is past.)
    const run = await runIfRequested(ds, settings, APP_URL, { quietSeconds: QUIET, now: seconds(casesAt, QUIET + 1) });
    expect(run).toMatchObject({ status: 'succeeded' });
    expect(await runIfRequested(ds, settings, APP_URL, { quietSeconds: QUIET, now: seconds(casesAt, 10 * QUIET) })).toBeNull();

    expect(await runCount()).toBe(2);
    const [taken] = (await ds.query(`SELECT inputs FROM runs WHERE id = $1`, [run!.status === 'succeeded' ? run!.runId : ''])) as Array<{
      inputs: { requestIds: string[] };
    }>;
    expect(taken!.inputs.requestIds).toHaveLength(2);
    expect(pendingRunSchema.parse(await get('/api/runs/pending')).pending).toBeNull();
    // Both in: the new month is complete, the IRR by hand 0.983, and no flag, no notice.
    const results = await companyResults();
    const nov = results.get(`${c.groups.exp}|${NEW_MONTH}`)!;
    expect(nov.completeness).toBe('complete');
    expect(nov.irr.estimate as number).toBeCloseTo(10 / 54_000 / (13 / 69_000), 10);
    expect(await flagsAndNotices()).toEqual({ flags: [], notices: 0 });
    const detail = runDetailSchema.parse(await get('/api/runs/current'));
    expect(detail.completeThrough).toMatchObject({ company: `${NEW_MONTH}-01` });
    expect(detail.completeThrough!.sites).toEqual(
      expect.arrayContaining([
        { siteId: c.sites.north, month: `${NEW_MONTH}-01` },
        { siteId: c.sites.south, month: `${NEW_MONTH}-01` },
      ]),
    );
  });

  it('a run between the two (the run button) marks the month partial, and no rule looks at it', async () => {
    await c.newMonthRoster();
    const asked = await c.hygienist.agent.post('/api/runs').set('x-csrf-token', c.hygienist.csrf).expect(202);
    expect(asked.body.requestId).toBeTruthy();
    expect(pendingRunSchema.parse(await get('/api/runs/pending')).pending).toMatchObject({ immediate: true });
    // The run button does not wait for the quiet interval.
    expect(await runIfRequested(ds, settings, APP_URL, { quietSeconds: QUIET, now: await latestRequestAt() })).toMatchObject({ status: 'succeeded' });

    const results = await companyResults();
    const nov = results.get(`${c.groups.exp}|${NEW_MONTH}`)!;
    const oct = results.get(`${c.groups.exp}|2026-10`)!;
    expect(nov.completeness).toBe('partial');
    expect(oct.completeness).toBe('complete');
    // The partial window's figures are over the rule (IRR by hand 1.597), the complete one's are not (1.25) ...
    expect(nov.irr.estimate as number).toBeCloseTo(10 / 54_000 / (8 / 69_000), 10);
    expect(oct.irr.estimate as number).toBeCloseTo(10 / 8, 10);
    // ... and the rule looked at complete periods only: no flag, no notice.
    expect(await flagsAndNotices()).toEqual({ flags: [], notices: 0 });
    const between = runDetailSchema.parse(await get('/api/runs/current'));
    expect(between.completeThrough).toMatchObject({ company: '2026-10-01' });

    await c.newMonthCases();
    expect(await runIfRequested(ds, settings, APP_URL, { quietSeconds: QUIET, now: seconds(await latestRequestAt(), QUIET + 1) })).toMatchObject({
      status: 'succeeded',
    });
    expect((await companyResults()).get(`${c.groups.exp}|${NEW_MONTH}`)!.completeness).toBe('complete');
    expect(await flagsAndNotices()).toEqual({ flags: [], notices: 0 });
    // The run between still says what it saw (its own period states, not today's): read by the physician, who reads earlier runs.
    await provisionUser(ds, 'physician@demo.ratewarden.test', 'physician', await allSiteIds(ds));
    const physician = await signIn(app, 'physician@demo.ratewarden.test');
    const earlier = runResultSchema
      .array()
      .parse((await physician.agent.get(`/api/runs/${between.id}/results?outcomeId=${c.outcome}&window=rolling12`).expect(200)).body);
    expect(earlier.find((r) => r.exposureGroupId === c.groups.exp && r.period === `${NEW_MONTH}-01`)!.completeness).toBe('partial');
  });

  it('with RULES_ON_PARTIAL_PERIODS the same roster-only run raises the flag on the partial month (the setting, and the check above, are real)', async () => {
    await c.newMonthRoster();
    const o = await performRun(ds, { trigger: 'cli', settings, appUrl: APP_URL, rulesOnPartialPeriods: true });
    expect(o).toMatchObject({ status: 'succeeded' });
    const after = await flagsAndNotices();
    expect(after.flags).toEqual([{ period: NEW_MONTH, state: 'raised' }]);
    expect(after.notices).toBeGreaterThan(0);
  });
});

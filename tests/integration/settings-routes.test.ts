import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createApp } from '@ratewarden/api/app';
import { runDetailSchema, runResultSchema, runStrataSchema } from '@ratewarden/shared/runs';
import { analysisSettingsSchema, settingsUpdateResultSchema, type SettingsUpdate } from '@ratewarden/shared/settings';
import { performRun } from '@ratewarden/worker/runs/perform-run';
import { provisionUser, signIn, type SignedInAgent } from '../support/sign-in';
import { testApiConfig } from '../support/test-config';
import { allSiteIds, openTestDataSource } from '../support/test-db';
import { clearCohortData, makeCohort, settings as defaults, type Cohort } from './runs-fixture';

/**
 * Analysis settings as versions: who changes them, what a change writes (a version, an audit line,
 * a run request), and that the next run computes with them. Cohort: group EXP in December 2031,
 * 30 workers at 160 h (0.08 person-years each at 2,000 h): 10 born 2000 (age 31 that year) with
 * 6 cases, 10 born 1990 (41), 10 born 1970 (61); group REF, 10 born 2000 with 2 cases.
 */
describe('analysis settings', () => {
  let ds: DataSource;
  let c: Cohort;
  let as: Record<'hygienist' | 'safety' | 'physician' | 'admin', SignedInAgent>;

  const put = (who: SignedInAgent, body: object) => who.agent.put('/api/settings').set('x-csrf-token', who.csrf).send(body);
  const ninety: SettingsUpdate = {
    personTimeBasis: 'person_years',
    per: 1000,
    confidence: 0.9,
    countedStatuses: ['confirmed'],
    ageBandEdges: [18, 25, 35, 45, 55, 65],
  };

  beforeAll(async () => {
    ds = await openTestDataSource();
    await clearCohortData(ds);
    c = await makeCohort(ds, {
      groups: [
        ['REF', 0],
        ['EXP', 1],
      ],
      reference: 'REF',
      outcomes: [['SET', 'recurrent']],
    });
    const site = c.sites[0]!;
    const rows: Array<[number, string, number, number, number]> = [];
    const cases: Array<[number, number, string]> = [];
    for (const [key, birth, group, n] of [
      ['e31', 2000, c.groups.EXP!, 6],
      ['e41', 1990, c.groups.EXP!, 0],
      ['e61', 1970, c.groups.EXP!, 0],
      ['r31', 2000, c.groups.REF!, 2],
    ] as const) {
      for (let i = 0; i < 10; i++) {
        const w = await c.worker(`${key}${i}`, birth, 'M');
        rows.push([w, '2031-12-01', site, group, 160]);
        if (i < n) cases.push([w, c.outcomes.SET!, '2031-12-15']);
      }
    }
    await c.roster(rows);
    await c.cases(cases);
    const sites = await allSiteIds(ds);
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', sites);
    await provisionUser(ds, 'safety@demo.ratewarden.test', 'safety_manager', sites);
    await provisionUser(ds, 'physician@demo.ratewarden.test', 'physician', sites);
    await provisionUser(ds, 'admin@demo.ratewarden.test', 'administrator');
    const app = createApp({ dataSource: ds, config: testApiConfig() });
    as = {
      hygienist: await signIn(app, 'hygienist@demo.ratewarden.test'),
      safety: await signIn(app, 'safety@demo.ratewarden.test'),
      physician: await signIn(app, 'physician@demo.ratewarden.test'),
      admin: await signIn(app, 'admin@demo.ratewarden.test'),
    };
  });
  afterAll(async () => {
    // The settings are shared by the test database: later files compute with the defaults again.
    await put(as.hygienist, { ...defaults, ageBandEdges: [10, 20, 30, 40, 50, 60, 70, 80, 90] }).expect(200);
    await ds?.destroy();
  });

  it('seeds version 1 of a new database from the worker environment, and every run records its version', async () => {
    const run = await performRun(ds, { trigger: 'cli', settings: defaults, appUrl: 'http://127.0.0.1/' });
    expect(run.status).toBe('succeeded');
    const s = analysisSettingsSchema.parse((await as.physician.agent.get('/api/settings').expect(200)).body);
    expect(s.current).not.toBeNull();
    const first = [s.current!, ...s.history].at(-1)!; // history is newest first: its last is version 1
    expect(first).toMatchObject({ version: 1, createdBy: 'worker environment' });
    const detail = runDetailSchema.parse((await as.hygienist.agent.get(`/api/runs/${(run as { runId: string }).runId}`).expect(200)).body);
    expect(detail.settingsVersion).toBe(s.current!.version);
  });

  it('lets the administrator and the hygienist change the settings, nobody else; refuses a bad version', async () => {
    await put(as.safety, ninety).expect(403);
    await put(as.physician, ninety).expect(403);
    const bad = await put(as.admin, { ...ninety, ageBandEdges: [65, 18] }).expect(422);
    expect(JSON.stringify(bad.body)).toMatch(/increase/);
    await put(as.admin, { ...ninety, confidence: 90 }).expect(422);
  });

  it('writes a change as the next version, with who, an audit line and a run request; the same body again writes nothing', async () => {
    const before = analysisSettingsSchema.parse((await as.admin.agent.get('/api/settings').expect(200)).body).current!;
    const requestsBefore = Number(((await ds.query(`SELECT count(*) AS n FROM run_requests WHERE picked_at IS NULL`)) as Array<{ n: string }>)[0]!.n);
    const res = settingsUpdateResultSchema.parse((await put(as.admin, ninety).expect(200)).body);
    expect(res).toMatchObject({ changed: true, runRequested: true, current: { version: before.version + 1, createdBy: expect.any(String), settings: ninety } });
    const [audit] = (await ds.query(`SELECT action, detail FROM audit_events WHERE target = $1`, [`settings:${res.current.version}`])) as Array<{
      action: string;
      detail: { before: { confidence: number }; after: { confidence: number } };
    }>;
    expect(audit).toMatchObject({ action: 'settings.change', detail: { before: { confidence: before.settings.confidence }, after: { confidence: 0.9 } } });
    const [requests] = (await ds.query(`SELECT count(*) AS n FROM run_requests WHERE picked_at IS NULL`)) as Array<{ n: string }>;
    expect(Number(requests!.n)).toBe(requestsBefore + 1);
    const again = settingsUpdateResultSchema.parse((await put(as.hygienist, { ...ninety, countedStatuses: ['confirmed'] }).expect(200)).body);
    expect(again).toMatchObject({ changed: false, current: { version: res.current.version } });
    const all = analysisSettingsSchema.parse((await as.safety.agent.get('/api/settings').expect(200)).body);
    expect(all.current!.version).toBe(res.current.version);
    expect(all.history[0]!.version).toBe(before.version);
  });

  it('computes the next run with the new version: 90 % intervals and the chosen age bands', async () => {
    // The caller's settings only seed a new database: the run takes the current version.
    const run = await performRun(ds, { trigger: 'cli', settings: defaults, appUrl: 'http://127.0.0.1/' });
    expect(run.status).toBe('succeeded');
    const runId = (run as { runId: string }).runId;
    const detail = runDetailSchema.parse((await as.hygienist.agent.get(`/api/runs/${runId}`).expect(200)).body);
    expect(detail.settings).toMatchObject({ confidence: 0.9, ageBandEdges: ninety.ageBandEdges });
    const results = (
      (
        await as.physician.agent
          .get(`/api/runs/${runId}/results`)
          .query({ outcomeId: c.outcomes.SET, exposureGroupId: c.groups.EXP, window: 'month' })
          .expect(200)
      ).body as unknown[]
    ).map((r) => runResultSchema.parse(r));
    const dec = results.find((r) => r.siteId === null && r.period === '2031-12-01')!;
    // 6 cases in 30 × 160 h = 2.4 person-years. Exact (Garwood) 90 % limits on the count are
    // χ²(0.05; 12)/2 = 5.226/2 and χ²(0.95; 14)/2 = 23.685/2 (chi-square table, e.g. NIST/SEMATECH
    // e-Handbook of Statistical Methods, 1.3.6.7.4, values from memory, to 3 decimals).
    expect(dec.cases).toBe(6);
    expect(dec.rate.estimate).toBeCloseTo((6 / 2.4) * 1000, 9);
    expect((Number(dec.rate.lower) / 1000) * 2.4).toBeCloseTo(5.226 / 2, 2);
    expect((Number(dec.rate.upper) / 1000) * 2.4).toBeCloseTo(23.685 / 2, 2);
    const strata = runStrataSchema.parse(
      (
        await as.physician.agent
          .get(`/api/runs/${runId}/strata`)
          .query({ outcomeId: c.outcomes.SET, exposureGroupId: c.groups.EXP, window: 'month', period: '2031-12-01', by: 'age' })
          .expect(200)
      ).body,
    );
    // Ages 31, 41 and 61 in 2031 fall in 25–34, 35–44 and 55–64.
    expect(strata.strata.map((s) => [s.key, s.label, s.exposed.cases])).toEqual([
      ['25', '25–34', 6],
      ['35', '35–44', 0],
      ['55', '55–64', 0],
    ]);
  });
});

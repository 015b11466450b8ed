import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createApp } from '@ratewarden/api/app';
import { runPeriodIndexSchema, runResultSchema, runStrataSchema, type RunSettings } from '@ratewarden/shared/runs';
import { analysisSettingsSchema } from '@ratewarden/shared/settings';
import { compareRates } from '@ratewarden/shared/stats';
import { offeredWindows } from '@ratewarden/shared/windows';
import { currentAnalysisSettings } from '@ratewarden/worker/runs/analysis-settings';
import { performRun } from '@ratewarden/worker/runs/perform-run';
import { provisionUser, signIn, type SignedInAgent } from '../support/sign-in';
import { testApiConfig } from '../support/test-config';
import { allSiteIds, openTestDataSource } from '../support/test-db';
import { clearCohortData, makeCohort, settings as defaults, storedResults, type Cohort } from './runs-fixture';

/**
 * Calendar quarter, calendar year and whole-period windows (shared/src/windows.ts) through the
 * settings page's version and a run. Cohort, worked out by hand: one site, groups EXP and REF of
 * 10 workers each at 160 h a month (1,600 h = 0.8 person-years at 2,000 h) in January–June and
 * December 2031. Cases by month, EXP: 2, 2, 2 | 5, 0, 5 | December 3; REF: 1, 0, 1 | 5, 0, 0 | 0.
 * - Q1: EXP 6 cases, REF 2, 2.4 person-years each: IRR (6 / 2.4) / (2 / 2.4) = 3, EXP rate 2,500 per 1,000.
 * - Q2: EXP 10, REF 5: IRR 2. Q4: December alone, EXP 3, REF 0.
 * - Year 2031: EXP 19, REF 7, 11,200 h each; the same months as the rolling 12 ending December 2031.
 * - Whole period from February 2031, at June: EXP 2 + 2 + 5 + 0 + 5 = 14, REF 0 + 1 + 5 + 0 + 0 = 6, 8,000 h.
 */
describe('analysis windows: quarter, year and whole period', () => {
  let ds: DataSource;
  let c: Cohort;
  let runId: string;
  let results: Map<string, Record<string, unknown>>;
  let as: Record<'hygienist' | 'physician' | 'safety', SignedInAgent>;
  let before: RunSettings;

  const put = (who: SignedInAgent, body: object) => who.agent.put('/api/settings').set('x-csrf-token', who.csrf).send(body);
  const base = (s: RunSettings) => ({
    personTimeBasis: s.personTimeBasis,
    per: s.per,
    confidence: s.confidence,
    countedStatuses: s.countedStatuses,
    ageBandEdges: s.ageBandEdges ?? [10, 20, 30, 40, 50, 60, 70, 80, 90],
  });
  const EXP_CASES: Record<string, number> = { '01': 2, '02': 2, '03': 2, '04': 5, '05': 0, '06': 5, '12': 3 };
  const REF_CASES: Record<string, number> = { '01': 1, '02': 0, '03': 1, '04': 5, '05': 0, '06': 0, '12': 0 };

  beforeAll(async () => {
    ds = await openTestDataSource();
    await clearCohortData(ds);
    c = await makeCohort(ds, {
      groups: [
        ['REF', 0],
        ['EXP', 1],
      ],
      reference: 'REF',
      outcomes: [['WIN', 'recurrent']],
    });
    const site = c.sites[0]!;
    const rows: Array<[number, string, number, number, number]> = [];
    const cases: Array<[number, number, string]> = [];
    for (const [key, group, perMonth] of [
      ['e', c.groups.EXP!, EXP_CASES],
      ['r', c.groups.REF!, REF_CASES],
    ] as const) {
      for (let i = 0; i < 10; i++) {
        const w = await c.worker(`${key}${i}`, 1990, i % 2 ? 'F' : 'M');
        for (const [mm, n] of Object.entries(perMonth)) {
          rows.push([w, `2031-${mm}-01`, site, group, 160]);
          if (i < n) cases.push([w, c.outcomes.WIN!, `2031-${mm}-10`]);
        }
      }
    }
    await c.roster(rows);
    await c.cases(cases);
    const sites = await allSiteIds(ds);
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', sites);
    await provisionUser(ds, 'physician@demo.ratewarden.test', 'physician', sites);
    await provisionUser(ds, 'safety@demo.ratewarden.test', 'safety_manager', sites);
    const app = createApp({ dataSource: ds, config: testApiConfig() });
    as = {
      hygienist: await signIn(app, 'hygienist@demo.ratewarden.test'),
      physician: await signIn(app, 'physician@demo.ratewarden.test'),
      safety: await signIn(app, 'safety@demo.ratewarden.test'),
    };
    // Version 1 of a new test database comes from the worker environment, as a first run would write it (settings-routes.test.ts reads it).
    await currentAnalysisSettings(ds, defaults);
    before = analysisSettingsSchema.parse((await as.hygienist.agent.get('/api/settings').expect(200)).body).current?.settings ?? defaults;
  });
  afterAll(async () => {
    // The settings are shared by the test database: put back the windows in force before.
    await put(as.hygienist, { ...base(before), windows: offeredWindows(before), wholePeriodStart: before.wholePeriodStart ?? null }).expect(200);
    await ds?.destroy();
  });

  it('the settings refuse a set of windows without the month, and a whole period without its start', async () => {
    const bad = await put(as.hygienist, { ...base(before), windows: ['rolling12', 'quarter'] }).expect(422);
    expect(JSON.stringify(bad.body)).toContain('the month is always offered');
    const noStart = await put(as.hygienist, { ...base(before), windows: ['month', 'whole'] }).expect(422);
    expect(JSON.stringify(noStart.body)).toContain('whole period starts');
    await put(as.safety, { ...base(before), windows: ['month', 'quarter'] }).expect(403);
  });

  it('a version offering quarters, years and the whole period is saved and the next run computes exactly those windows', async () => {
    const saved = await put(as.hygienist, {
      ...base(before),
      windows: ['whole', 'month', 'quarter', 'year'],
      wholePeriodStart: '2031-02-01',
    }).expect(200);
    expect(saved.body.current.settings.windows).toEqual(['month', 'quarter', 'year', 'whole']);
    expect(saved.body.current.settings.wholePeriodStart).toBe('2031-02-01');
    const outcome = await performRun(ds, { trigger: 'cli', settings: defaults, appUrl: 'http://127.0.0.1/' });
    expect(outcome.status).toBe('succeeded');
    runId = (outcome as { runId: string }).runId;
    results = await storedResults(ds, runId, c.outcomes.WIN!);
    const kinds = new Set([...results.keys()].map((k) => k.split(':')[1]));
    // Rolling 12 months was not offered: not computed.
    expect([...kinds].sort()).toEqual(['month', 'quarter', 'whole', 'year']);
    // Quarters at their last months only (none for July–September, which has no hours); years in December; whole periods from February on.
    const periods = (kind: string) => [...new Set([...results.keys()].filter((k) => k.split(':')[1] === kind).map((k) => k.split(':')[2]))].sort();
    expect(periods('quarter')).toEqual(['2031-03', '2031-06', '2031-12']);
    expect(periods('year')).toEqual(['2031-12']);
    // (A whole period runs on through the months without hours: its sum is still that of the months before.)
    expect(periods('whole')).toEqual(Array.from({ length: 11 }, (_, i) => `2031-${String(i + 2).padStart(2, '0')}`));
    expect(results.get(`${c.groups.EXP}:whole:2031-09`)!.cases).toBe(14);
  });

  it.each([
    ['EXP', 'quarter', '2031-03', 6, 4800],
    ['REF', 'quarter', '2031-03', 2, 4800],
    ['EXP', 'quarter', '2031-06', 10, 4800],
    ['EXP', 'quarter', '2031-12', 3, 1600],
    ['EXP', 'year', '2031-12', 19, 11200],
    ['REF', 'year', '2031-12', 7, 11200],
    ['EXP', 'whole', '2031-06', 14, 8000],
    ['REF', 'whole', '2031-06', 6, 8000],
  ] as const)('%s %s %s: the sum of its months (%i cases, %i h)', (group, window, period, cases, hours) => {
    const r = results.get(`${c.groups[group]}:${window}:${period}`)!;
    expect(r.cases).toBe(cases);
    expect(Number(r.hours)).toBe(hours);
  });

  it('the first quarter: IRR 3 and rate 2,500 per 1,000 person-years by hand; its limits as the shared core gives them on the summed counts', () => {
    const r = results.get(`${c.groups.EXP}:quarter:2031-03`)!;
    expect(r.irr as number).toBeCloseTo(3, 12);
    expect(r.rate as number).toBeCloseTo(2500, 9);
    const core = compareRates({ cases: 6, personTime: 2.4 }, { cases: 2, personTime: 2.4 }, { confidence: before.confidence, per: 1000 });
    expect(r.irr_lower as number).toBeCloseTo(core.irr.exact.lower as number, 9);
    expect(r.irr_upper as number).toBeCloseTo(core.irr.exact.upper as number, 9);
    expect(r.ird as number).toBeCloseTo(((6 - 2) / 2.4) * 1000, 9);
    expect(results.get(`${c.groups.EXP}:quarter:2031-06`)!.irr as number).toBeCloseTo(2, 12);
  });

  it('per role: the physician reads every quarter; the hygienist gets the scope with small months by calendar year only', async () => {
    const read = async (who: SignedInAgent, window: string) =>
      runResultSchema.array().parse((await who.agent.get(`/api/runs/${runId}/results`).query({ outcomeId: c.outcomes.WIN, window }).expect(200)).body);
    const doctor = await read(as.physician, 'quarter');
    expect(doctor.find((r) => r.exposureGroupId === c.groups.EXP && r.period === '2031-03-01')!.cases).toBe(6);
    // Small months (1, 2 and 3 cases) in both groups: their quarters and whole periods are withheld ('months'), every figure with them.
    for (const window of ['quarter', 'whole']) {
      const mine = await read(as.hygienist, window);
      expect(mine.length).toBeGreaterThan(0);
      for (const r of mine) {
        expect(r.cases, `${window} ${r.period}`).toBeNull();
        expect(r.withheld).toBe('months');
        expect([r.rate.estimate, r.irr.estimate, r.ird.estimate]).toEqual([null, null, null]);
      }
    }
    // The calendar year is shown (19 and 7 cases, no small site to protect).
    const years = await read(as.hygienist, 'year');
    expect(years.find((r) => r.exposureGroupId === c.groups.EXP)!.cases).toBe(19);
    expect(years.find((r) => r.exposureGroupId === c.groups.REF)!.cases).toBe(7);
    // The period index of the quarter window lists its ends only, newest first.
    const index = runPeriodIndexSchema.parse(
      (await as.hygienist.agent.get(`/api/runs/${runId}/periods`).query({ outcomeId: c.outcomes.WIN, window: 'quarter' }).expect(200)).body,
    );
    expect(index.periods.map((p) => p.period)).toEqual(['2031-12-01', '2031-06-01', '2031-03-01']);
    expect(index.periods.every((p) => !p.someGroupShown)).toBe(true);
  });

  it('several windows in one read (the trends page) give exactly the rows of each window read alone, for each role', async () => {
    for (const who of [as.physician, as.hygienist]) {
      const get = async (query: Record<string, string | number>) =>
        runResultSchema.array().parse(
          (
            await who.agent
              .get(`/api/runs/${runId}/results`)
              .query({ outcomeId: c.outcomes.WIN, ...query })
              .expect(200)
          ).body,
        );
      const both = await get({ windows: 'month,quarter' });
      const alone = [...(await get({ window: 'month' })), ...(await get({ window: 'quarter' }))];
      expect(new Set(both.map((r) => r.window))).toEqual(new Set(['month', 'quarter']));
      const key = (r: { exposureGroupId: number; window: string; period: string }) => `${r.exposureGroupId}|${r.window}|${r.period}`;
      expect([...both].sort((a, b) => key(a).localeCompare(key(b)))).toEqual([...alone].sort((a, b) => key(a).localeCompare(key(b))));
    }
    await as.hygienist.agent.get(`/api/runs/${runId}/results`).query({ outcomeId: c.outcomes.WIN, windows: 'month,fortnight' }).expect(422);
  });

  it("stratum tables of a quarter: the physician's add up to the quarter; everyone else's are withheld whole", async () => {
    const q = { outcomeId: c.outcomes.WIN, exposureGroupId: c.groups.EXP, window: 'quarter', period: '2031-03-01', by: 'sex' };
    const doctor = runStrataSchema.parse((await as.physician.agent.get(`/api/runs/${runId}/strata`).query(q).expect(200)).body);
    expect(doctor.strata.reduce((n, s) => n + s.exposed.cases!, 0)).toBe(6);
    const mine = runStrataSchema.parse((await as.hygienist.agent.get(`/api/runs/${runId}/strata`).query(q).expect(200)).body);
    expect(mine.strata.every((s) => s.exposed.cases === null && s.exposed.withheld !== null)).toBe(true);
  });
});

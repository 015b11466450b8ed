import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createApp } from '@ratewarden/api/app';
import { runStrataSchema, type RunStrata } from '@ratewarden/shared/runs';
import { rateRatio } from '@ratewarden/shared/stats';
import { performRun } from '@ratewarden/worker/runs/perform-run';
import { provisionUser, signIn, type SignedInAgent } from '../support/sign-in';
import { testApiConfig } from '../support/test-config';
import { allSiteIds, openTestDataSource } from '../support/test-db';
import { clearCohortData, makeCohort, settings, type Cohort } from './runs-fixture';

/**
 * The stratum table behind an adjusted figure, from the cells a run stored. Hand-built cohort at
 * one site, 160 h a worker-month (0.08 person-years at 2,000 h a year):
 *   EXP, December 2031: 10 workers born 1995 (age band 30–39) with 6 cases, 10 born 1985 (40–49) with
 *        3 cases, 2 of unknown birth year at 100 h with none; November 2031: 10 born 1995, 2 cases.
 *   REF, December 2031: 10 born 1995 with 5 cases, 10 born 1985 with 7 cases.
 * Expected figures are worked out here: each stratum's IRR is the ratio of its rates, (a/T1)/(b/T0).
 */
describe('run strata: the stratum table of the adjusted view', () => {
  let ds: DataSource;
  let c: Cohort;
  let runId: string;
  let as: Record<'hygienist' | 'physician' | 'safety', SignedInAgent>;

  beforeAll(async () => {
    ds = await openTestDataSource();
    await clearCohortData(ds);
    c = await makeCohort(ds, {
      groups: [
        ['REF', 0],
        ['EXP', 1],
      ],
      reference: 'REF',
      outcomes: [['STR', 'recurrent']],
    });
    const site = c.sites[0]!;
    const rows: Array<[number, string, number, number, number]> = [];
    const cases: Array<[number, number, string]> = [];
    const people = async (key: string, n: number, birth: number | null, group: number, months: string[], hours: number, caseCounts: Record<string, number>) => {
      for (let i = 0; i < n; i++) {
        const w = await c.worker(`${key}${i}`, birth, 'F');
        for (const m of months) rows.push([w, m, site, group, hours]);
        for (const [m, count] of Object.entries(caseCounts)) if (i < count) cases.push([w, c.outcomes.STR!, `${m.slice(0, 8)}12`]);
      }
    };
    await people('e30', 10, 1995, c.groups.EXP!, ['2031-11-01', '2031-12-01'], 160, { '2031-11-01': 2, '2031-12-01': 0 });
    await people('e40', 10, 1985, c.groups.EXP!, ['2031-12-01'], 160, { '2031-12-01': 3 });
    await people('eunk', 2, null, c.groups.EXP!, ['2031-12-01'], 100, {});
    await people('r30', 10, 1995, c.groups.REF!, ['2031-12-01'], 160, { '2031-12-01': 5 });
    await people('r40', 10, 1985, c.groups.REF!, ['2031-12-01'], 160, { '2031-12-01': 7 });
    await c.roster(rows);
    // 6 December cases in the 30–39 band, on other workers than November's two: e304 … e309.
    const e30 = ((await ds.query(`SELECT id FROM workers WHERE worker_key LIKE $1 ORDER BY worker_key`, [`${c.tag}-e30_`])) as Array<{ id: string }>).map((r) =>
      Number(r.id),
    );
    for (const w of e30.slice(4)) cases.push([w, c.outcomes.STR!, '2031-12-20']);
    await c.cases(cases);
    const outcome = await performRun(ds, { trigger: 'cli', settings, appUrl: 'http://127.0.0.1/' });
    expect(outcome.status).toBe('succeeded');
    runId = (outcome as { runId: string }).runId;
    const allSites = await allSiteIds(ds);
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', allSites);
    await provisionUser(ds, 'physician@demo.ratewarden.test', 'physician', allSites);
    await provisionUser(ds, 'safety@demo.ratewarden.test', 'safety_manager', [site]);
    const app = createApp({ dataSource: ds, config: testApiConfig() });
    as = {
      hygienist: await signIn(app, 'hygienist@demo.ratewarden.test'),
      physician: await signIn(app, 'physician@demo.ratewarden.test'),
      safety: await signIn(app, 'safety@demo.ratewarden.test'),
    };
  });
  afterAll(async () => {
    await ds.destroy();
  });

  const strata = async (who: SignedInAgent, query: Record<string, string | number>): Promise<RunStrata> => {
    const res = await who.agent
      .get(`/api/runs/${runId}/strata`)
      .query({ outcomeId: c.outcomes.STR, exposureGroupId: c.groups.EXP, window: 'month', period: '2031-12-01', by: 'age', ...query });
    expect(res.status).toBe(200);
    return runStrataSchema.parse(res.body);
  };

  it('gives the physician every stratum with its own IRR, and the strata add up to the group', async () => {
    const s = await strata(as.physician, {});
    expect(s.referenceGroupId).toBe(c.groups.REF);
    expect(s.strata.map((x) => x.label)).toEqual(['30–39', '40–49', 'not recorded']);
    const [b30, b40, unknown] = s.strata;
    expect(b30).toMatchObject({ key: '30', exposed: { cases: 6, hours: '1600.00', withheld: null }, reference: { cases: 5, hours: '1600.00' } });
    expect(b30!.exposed.personTime).toBeCloseTo(0.8, 12);
    expect(b30!.irr!.estimate).toBeCloseTo(6 / 5, 12); // equal person-time: the ratio of the counts
    expect(b40!.irr!.estimate).toBeCloseTo(3 / 7, 12);
    // The stratum's exact limits are the core's exact conditional interval for the same counts.
    const exact = rateRatio({ cases: 3, personTime: 0.8 }, { cases: 7, personTime: 0.8 }, 0.95).exact;
    expect(b40!.irr!.lower).toBeCloseTo(exact.lower as number, 12);
    expect(b40!.irr!.upper).toBeCloseTo(exact.upper as number, 12);
    // IRD per 1,000 person-years: (3 − 7) / 0.8 × 1,000.
    expect(b40!.ird!.estimate).toBeCloseTo(-5000, 9);
    expect(unknown).toMatchObject({ key: null, exposed: { cases: 0, hours: '200.00' }, reference: { cases: 0, hours: '0.00' } });
    const [row] = (await ds.query(
      `SELECT cases, hours::text FROM run_results WHERE run_id = $1 AND site_id IS NULL AND outcome_id = $2 AND exposure_group_id = $3 AND window_kind = 'month' AND period = '2031-12-01'`,
      [runId, c.outcomes.STR, c.groups.EXP],
    )) as Array<{ cases: number; hours: string }>;
    expect(s.strata.reduce((t, x) => t + x.exposed.cases!, 0)).toBe(row!.cases);
    expect(s.strata.reduce((t, x) => t + Number(x.exposed.hours), 0)).toBeCloseTo(Number(row!.hours), 9);
  });

  it('sums the months of a rolling window', async () => {
    const s = await strata(as.physician, { window: 'rolling12' });
    expect(s.strata[0]).toMatchObject({ label: '30–39', exposed: { cases: 8, hours: '3200.00' } }); // November 2 + December 6, 2 × 1,600 h
  });

  it('withholds a table with a small stratum whole, and shows others only in yearly windows, to everyone but the physician', async () => {
    // The latest rolling window (December) is the yearly one. Exposed: 8 + 3: the 3 is small, so the
    // whole arm goes, zeros too (they would say how many strata share the 11); the reference arm
    // (5 + 7) has nothing small and is shown, with its person-time.
    const s = await strata(as.hygienist, { window: 'rolling12' });
    const [b30, b40, unknown] = s.strata;
    for (const x of [b30!, b40!, unknown!]) {
      expect(x.exposed).toMatchObject({ cases: null, withheld: 'strata', rate: null });
      expect(x.irr).toBeNull();
      expect(x.ird).toBeNull();
    }
    expect(b30!.exposed.personTime).toBeCloseTo(1.6, 12);
    expect(b30!.reference).toMatchObject({ cases: 5, withheld: null });
    expect(b40!.reference).toMatchObject({ cases: 7, withheld: null });
    // Single months and earlier rolling windows overlap the yearly one: their tables are the physician's.
    for (const q of [{ window: 'month' }, { window: 'rolling12', period: '2031-11-01' }] as Array<Record<string, string>>) {
      const other = await strata(as.hygienist, q);
      for (const x of other.strata) expect(x.exposed).toMatchObject({ cases: null, rate: null });
      const open = await strata(as.physician, q);
      expect(open.strata.some((x) => x.exposed.cases !== null && x.exposed.cases > 0)).toBe(true);
    }
  });

  it('keeps the scope rules of the results, and refuses site strata of one site', async () => {
    expect(
      (
        await as.safety.agent
          .get(`/api/runs/${runId}/strata`)
          .query({ outcomeId: c.outcomes.STR, exposureGroupId: c.groups.EXP, window: 'month', period: '2031-12-01', by: 'age' })
      ).status,
    ).toBe(403);
    const own = await strata(as.safety, { siteId: c.sites[0]! });
    expect(own.siteId).toBe(c.sites[0]);
    expect(own.strata.map((x) => x.label)).toEqual(['30–39', '40–49', 'not recorded']);
    const bySite = await as.hygienist.agent
      .get(`/api/runs/${runId}/strata`)
      .query({ outcomeId: c.outcomes.STR, exposureGroupId: c.groups.EXP, window: 'month', period: '2031-12-01', by: 'site', siteId: c.sites[0] });
    expect(bySite.status).toBe(400);
    const bad = await as.hygienist.agent
      .get(`/api/runs/${runId}/strata`)
      .query({ outcomeId: c.outcomes.STR, exposureGroupId: c.groups.EXP, window: 'month', period: 'May', by: 'age' });
    expect(bad.status).toBe(422);
  });
});

import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createApp } from '@ratewarden/api/app';
import { runResultSchema, type RunResult } from '@ratewarden/shared/runs';
import { performRun } from '@ratewarden/worker/runs/perform-run';
import { provisionUser, signIn, type SignedInAgent } from '../support/sign-in';
import { testApiConfig } from '../support/test-config';
import { allSiteIds, openTestDataSource } from '../support/test-db';
import { clearCohortData, makeCohort, settings, type Cohort } from './runs-fixture';

/**
 * Results through the API by who asks: site scoping (company-wide rows only for readers of every
 * site, per-site rows computed from that site alone) and small-cell suppression for every role
 * but the physician. Expected figures are worked out here from the definitions (rate = cases /
 * person-years × 1,000; IRR = ratio of rates; Mantel–Haenszel IRR = Σ aT0/T ÷ Σ bT1/T,
 * Rothman & Greenland 1998, ch. 15), from the roster below.
 */
describe('run results: site scoping and small-cell suppression', () => {
  let ds: DataSource;
  let c: Cohort;
  let as: Record<'safety' | 'physician' | 'hygienist', SignedInAgent>;
  let runId: string;
  let siteA: number;
  let siteB: number;

  // Site A: 8 exposed and 8 reference workers at 160 h (0.64 person-years a group), 3 exposed and
  // 6 reference cases. Site B: 8 exposed at 100 h (0.4 PY), 8 reference at 160 h (0.64 PY), 7
  // exposed and 2 reference cases. Everyone at site A is male and at site B female, so the sex
  // strata are the site strata.
  const PT = { aExp: 0.64, aRef: 0.64, bExp: 0.4, bRef: 0.64 };
  const CASES = { aExp: 3, aRef: 6, bExp: 7, bRef: 2 };

  beforeAll(async () => {
    ds = await openTestDataSource();
    await clearCohortData(ds);
    c = await makeCohort(ds, {
      groups: [
        ['REF', 0],
        ['EXP', 1],
      ],
      reference: 'REF',
      outcomes: [['SCO', 'recurrent']],
    });
    [siteA, siteB] = [c.sites[0]!, c.sites[1]!];
    const rows: Array<[number, string, number, number, number]> = [];
    const people: Record<keyof typeof CASES, number[]> = { aExp: [], aRef: [], bExp: [], bRef: [] };
    for (let i = 0; i < 8; i++) {
      for (const k of Object.keys(people) as Array<keyof typeof CASES>) {
        const w = await c.worker(`${k}${i}`, 1980, k.startsWith('a') ? 'M' : 'F');
        people[k].push(w);
        rows.push([w, '2031-12-01', k.startsWith('a') ? siteA : siteB, k.endsWith('Exp') ? c.groups.EXP! : c.groups.REF!, k === 'bExp' ? 100 : 160]);
      }
    }
    await c.roster(rows);
    const cases: Array<[number, number, string]> = [];
    for (const k of Object.keys(CASES) as Array<keyof typeof CASES>) {
      for (let i = 0; i < CASES[k]; i++) cases.push([people[k][i]!, c.outcomes.SCO!, '2031-12-10']);
    }
    await c.cases(cases);
    const outcome = await performRun(ds, { trigger: 'cli', settings, appUrl: 'http://127.0.0.1/' });
    expect(outcome.status).toBe('succeeded');
    runId = (outcome as { runId: string }).runId;

    const allSites = await allSiteIds(ds);
    await provisionUser(ds, 'safety@demo.ratewarden.test', 'safety_manager', [siteA]);
    await provisionUser(ds, 'physician@demo.ratewarden.test', 'physician', allSites);
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', allSites);
    const app = createApp({ dataSource: ds, config: testApiConfig() });
    as = {
      safety: await signIn(app, 'safety@demo.ratewarden.test'),
      physician: await signIn(app, 'physician@demo.ratewarden.test'),
      hygienist: await signIn(app, 'hygienist@demo.ratewarden.test'),
    };
  });
  afterAll(async () => {
    await ds.destroy();
  });

  const fetchResults = async (who: SignedInAgent, siteId?: number) => {
    // Rolling twelve months ending in December: the cohort's one month, and (its groups having small
    // months) the one window readers other than the physician get (disclosure-frame.ts).
    const res = await who.agent.get(`/api/runs/${runId}/results`).query({ outcomeId: c.outcomes.SCO, window: 'rolling12', ...(siteId && { siteId }) });
    return res;
  };
  const rowOf = (body: unknown, group: number): RunResult => {
    const rows = (body as unknown[]).map((r) => runResultSchema.parse(r));
    const row = rows.find((r) => r.exposureGroupId === group && r.period === '2031-12-01');
    expect(row).toBeDefined();
    return row!;
  };

  it('serves company-wide results to a reader of every site, adjusted by site and by sex', async () => {
    const res = await fetchResults(as.hygienist);
    expect(res.status).toBe(200);
    const exp = rowOf(res.body, c.groups.EXP!);
    expect(exp.siteId).toBeNull();
    expect(exp.cases).toBe(10);
    expect(exp.suppressed).toBe(false);
    const rateExp = (10 / (PT.aExp + PT.bExp)) * 1000;
    const rateRef = (8 / (PT.aRef + PT.bRef)) * 1000;
    expect(exp.rate.estimate).toBeCloseTo(rateExp, 9);
    expect(exp.irr.estimate).toBeCloseTo(rateExp / rateRef, 12);
    // Mantel–Haenszel over the two sites: Σ aT0/T ÷ Σ bT1/T.
    const num = (CASES.aExp * PT.aRef) / (PT.aExp + PT.aRef) + (CASES.bExp * PT.bRef) / (PT.bExp + PT.bRef);
    const den = (CASES.aRef * PT.aExp) / (PT.aExp + PT.aRef) + (CASES.bRef * PT.bExp) / (PT.bExp + PT.bRef);
    // The adjustments are functions of their strata, which include small counts (site A's 3, the
    // men's 3): withheld from the hygienist, shown to the physician.
    expect(exp.mhSite.irr).toEqual({ estimate: null, lower: null, upper: null, p: null });
    expect(exp.mhSex.irr).toEqual({ estimate: null, lower: null, upper: null, p: null });
    expect(exp.detail).not.toHaveProperty('mhSiteHomogeneity');
    const open = rowOf((await fetchResults(as.physician)).body, c.groups.EXP!);
    expect(open.mhSite.irr.estimate).toBeCloseTo(num / den, 12);
    // Sex strata coincide with the sites here, so the adjustment by sex is the same number.
    expect(open.mhSex.irr.estimate).toBeCloseTo(num / den, 12);
    expect(open.mhSex.irr.lower).toBeCloseTo(open.mhSite.irr.lower as number, 12);
  });

  it('serves one site computed from its cells alone, with small counts suppressed for a non-physician', async () => {
    const res = await fetchResults(as.hygienist, siteA);
    expect(res.status).toBe(200);
    const exp = rowOf(res.body, c.groups.EXP!);
    const ref = rowOf(res.body, c.groups.REF!);
    expect(exp.siteId).toBe(siteA);
    // 3 exposed cases is under the threshold of 5: the count and what gives it back are withheld.
    expect(exp).toMatchObject({ cases: null, suppressed: true, withheld: 'small' });
    expect(exp.rate).toEqual({ estimate: null, lower: null, upper: null });
    expect(exp.irr.estimate).toBeNull();
    expect(exp.ird.estimate).toBeNull();
    expect(exp.mhAge.irr.estimate).toBeNull();
    expect(exp.detail).toEqual({});
    expect(exp.personTime).toBeCloseTo(PT.aExp, 12); // person-time reveals no count
    // The reference group's 6 cases are not small, but the company's 8 minus them would give site
    // B's 2 back; and with 6 withheld beside it, 8 − (at least 5) would still leave 2 at most 3.
    // The company's months are shown (8 is not small), so both sites' counts go unlabelled
    // ('months': disclosure-frame.ts), and the rate with them.
    expect(ref).toMatchObject({ cases: null, suppressed: true, withheld: 'months' });
    expect(ref.rate.estimate).toBeNull();
    expect(ref.personTime).toBeCloseTo(PT.aRef, 12);
  });

  it('shows the physician every count, with the site-level comparison', async () => {
    const exp = rowOf((await fetchResults(as.physician, siteA).then((r) => (expect(r.status).toBe(200), r))).body, c.groups.EXP!);
    expect(exp).toMatchObject({ cases: 3, suppressed: false, comparisonSuppressed: false });
    expect(exp.rate.estimate).toBeCloseTo((3 / PT.aExp) * 1000, 9);
    expect(exp.irr.estimate).toBeCloseTo(3 / PT.aExp / (6 / PT.aRef), 12); // 0.5
  });

  it('withholds the site count that would give a small one back by subtraction (complementary suppression)', async () => {
    const company = rowOf((await fetchResults(as.hygienist)).body, c.groups.EXP!);
    expect(company.cases).toBe(10); // the company total is shown ...
    const res = await fetchResults(as.hygienist, siteB);
    const exp = rowOf(res.body, c.groups.EXP!);
    const ref = rowOf(res.body, c.groups.REF!);
    // ... so site B's 7 would give site A's 3 back (10 − 7): withheld too, with what gives it back.
    // (Its expected count comes from the reference count, withheld at site B: not shown either.)
    expect(exp).toMatchObject({ cases: null, suppressed: true, withheld: 'complement', expected: null });
    expect(exp.rate).toEqual({ estimate: null, lower: null, upper: null });
    expect(exp.irr).toMatchObject({ estimate: null, lower: null, upper: null, p: null });
    expect(ref).toMatchObject({ cases: null, suppressed: true, withheld: 'months' });
    // The physician sees both.
    const open = await fetchResults(as.physician, siteB);
    expect(rowOf(open.body, c.groups.EXP!)).toMatchObject({ cases: 7, withheld: null });
    expect(rowOf(open.body, c.groups.REF!)).toMatchObject({ cases: 2, withheld: null });
  });

  it('refuses company-wide figures and other sites to a safety manager who sees only some sites', async () => {
    const company = await fetchResults(as.safety);
    expect(company.status).toBe(403);
    expect(company.body.message).toMatch(/siteId/);
    expect(company.body.details).toEqual({ siteIds: [siteA] });
    expect((await fetchResults(as.safety, siteB)).status).toBe(403);
    const own = await fetchResults(as.safety, siteA);
    expect(own.status).toBe(200);
    expect(rowOf(own.body, c.groups.EXP!)).toMatchObject({ siteId: siteA, cases: null, suppressed: true });
    expect(rowOf(own.body, c.groups.REF!)).toMatchObject({ cases: null, withheld: 'months' }); // as for everyone but the physician
    const diff = await as.safety.agent.get('/api/runs/diff').query({ from: runId, to: runId });
    expect(diff.status).toBe(403);
    const ownDiff = await as.safety.agent.get('/api/runs/diff').query({ from: runId, to: runId, siteId: siteA });
    expect(ownDiff.status).toBe(200);
  });

  it('takes the threshold from the SMALL_CELL_THRESHOLD setting, and withholds a comparison whose reference count is small', async () => {
    // One setting for the worker (which decides the run's disclosure frame) and the API.
    const at3 = await performRun(ds, { trigger: 'cli', settings, appUrl: 'http://127.0.0.1/', smallCellThreshold: 3 });
    runId = (at3 as { runId: string }).runId;
    const app = createApp({ dataSource: ds, config: testApiConfig({ SMALL_CELL_THRESHOLD: '3' }) });
    const hygienist = await signIn(app, 'hygienist@demo.ratewarden.test');
    const siteAExp = rowOf((await fetchResults(hygienist, siteA)).body, c.groups.EXP!);
    expect(siteAExp).toMatchObject({ cases: 3, suppressed: false }); // 3 is not below 3
    const siteB = await fetchResults(hygienist, c.sites[1]);
    const siteBRef = rowOf(siteB.body, c.groups.REF!);
    expect(siteBRef).toMatchObject({ cases: null, suppressed: true, withheld: 'small' }); // 2 is
    // Site B's exposed count stands (nothing small beside it), but its comparisons are withheld:
    // the IRR times the exposed rate would give the reference count back.
    const siteBExp = rowOf(siteB.body, c.groups.EXP!);
    expect(siteBExp).toMatchObject({ cases: 7, suppressed: false, comparisonSuppressed: true, expected: null });
    expect(siteBExp.rate.estimate).toBeCloseTo((7 / PT.bExp) * 1000, 9);
    expect(siteBExp.irr).toMatchObject({ estimate: null, lower: null, upper: null, p: null });
    expect(siteBExp.mhAge.irr.estimate).toBeNull();
  });
  it('withholds in the run diff what the results withhold, the IRR too when the reference count is small', async () => {
    // A late case for site B's eighth exposed worker: 7 → 8 exposed cases at site B in December.
    const [w] = (await ds.query(`SELECT id FROM workers WHERE worker_key = $1`, [`${c.tag}-bExp7`])) as Array<{ id: string }>;
    await c.cases([[Number(w!.id), c.outcomes.SCO!, '2031-12-20']]);
    const next = await performRun(ds, { trigger: 'cli', settings, appUrl: 'http://127.0.0.1/', smallCellThreshold: 3 });
    expect(next.status).toBe('succeeded');
    const nextId = (next as { runId: string }).runId;
    const rowOfDiff = (body: { rows: Array<{ exposureGroupId: number; window: string; period: string; before: unknown; after: unknown }> }) =>
      body.rows.find((r) => r.exposureGroupId === c.groups.EXP && r.window === 'month' && r.period === '2031-12-01')!;
    // Threshold 3: site B's exposed count is shown, its reference count (2) is not, so neither is
    // the IRR; the earlier run's figures are the physician's ('earlier').
    const app = createApp({ dataSource: ds, config: testApiConfig({ SMALL_CELL_THRESHOLD: '3' }) });
    const hygienist = await signIn(app, 'hygienist@demo.ratewarden.test');
    const seen = await hygienist.agent.get('/api/runs/diff').query({ from: runId, to: nextId, siteId: siteB }).expect(200);
    expect(rowOfDiff(seen.body)).toMatchObject({ before: { cases: null, irr: null, withheld: 'earlier' }, after: { cases: 8, irr: null, withheld: null } });
    // And the earlier run's own results are the physician's now.
    expect((await hygienist.agent.get(`/api/runs/${runId}/results`).query({ outcomeId: c.outcomes.SCO })).status).toBe(403);
    expect((await as.physician.agent.get(`/api/runs/${runId}/results`).query({ outcomeId: c.outcomes.SCO })).status).toBe(200);
    const open = await as.physician.agent.get('/api/runs/diff').query({ from: runId, to: nextId, siteId: siteB }).expect(200);
    const row = rowOfDiff(open.body) as { before: { irr: number }; after: { irr: number } };
    expect(row.before.irr).toBeCloseTo(7 / PT.bExp / (2 / PT.bRef), 9);
    expect(row.after.irr).toBeCloseTo(8 / PT.bExp / (2 / PT.bRef), 9);
  });
});

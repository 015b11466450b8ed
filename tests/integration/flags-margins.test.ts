import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createApp } from '@ratewarden/api/app';
import { flagSchema } from '@ratewarden/shared/flags';
import { runResultSchema } from '@ratewarden/shared/runs';
import { performRun } from '@ratewarden/worker/runs/perform-run';
import { provisionUser, signIn, type SignedInAgent } from '../support/sign-in';
import { testApiConfig } from '../support/test-config';
import { allSiteIds, openTestDataSource } from '../support/test-db';
import { clearCohortData, makeCohort, settings, type Cohort } from './runs-fixture';

/**
 * When every site's part of a company count is small and they can only be the threshold's edge
 * (4 + 4 = 8 with the threshold 5: both sites shown as "<5", so each must be 4), the company
 * count itself is withheld, in the results and in the flag that reports it (worked out by hand).
 */
describe('the company count withheld by the site margin', () => {
  let ds: DataSource;
  let c: Cohort;
  let runId: string;
  let flagId: string;
  let as: Record<'safety' | 'physician', SignedInAgent>;

  beforeAll(async () => {
    ds = await openTestDataSource();
    await clearCohortData(ds);
    c = await makeCohort(ds, { groups: [['REF', 0], ['EXP', 1]], reference: 'REF', outcomes: [['EDGE', 'recurrent']] });
    const rows: Array<[number, string, number, number, number]> = [];
    const cases: Array<[number, number, string]> = [];
    for (const [s, site] of c.sites.entries()) {
      for (let i = 0; i < 6; i++) {
        const e = await c.worker(`e${s}-${i}`, 1980, 'F');
        const r = await c.worker(`r${s}-${i}`, 1980, 'M');
        rows.push([e, '2031-08-01', site, c.groups.EXP!, 160], [r, '2031-08-01', site, c.groups.REF!, 160]);
        if (i < 4) cases.push([e, c.outcomes.EDGE!, '2031-08-05']);
      }
    }
    await c.roster(rows);
    await c.cases(cases);
    const [rule] = (await ds.query(
      `INSERT INTO watch_rules (name, outcome_id, exposure_group_id, measure, threshold_on, threshold, min_cases, window_kind, fdr_control)
       VALUES ('Edge rate', $1, $2, 'rate', 'estimate', 1, 2, 'month', false) RETURNING id`,
      [c.outcomes.EDGE, c.groups.EXP],
    )) as Array<{ id: string }>;
    const outcome = await performRun(ds, { trigger: 'cli', settings, appUrl: 'http://127.0.0.1/' });
    expect(outcome.status).toBe('succeeded');
    runId = (outcome as { runId: string }).runId;
    flagId = ((await ds.query(`SELECT id FROM flags WHERE rule_id = $1`, [rule!.id])) as Array<{ id: string }>)[0]!.id;
    // Company figures are for readers of every site (other test files' sites exist too).
    const allSites = await allSiteIds(ds);
    await provisionUser(ds, 'safety@demo.ratewarden.test', 'safety_manager', allSites);
    await provisionUser(ds, 'physician@demo.ratewarden.test', 'physician', allSites);
    const app = createApp({ dataSource: ds, config: testApiConfig() });
    as = { safety: await signIn(app, 'safety@demo.ratewarden.test'), physician: await signIn(app, 'physician@demo.ratewarden.test') };
  });
  afterAll(async () => {
    await ds.destroy();
  });

  it('withholds the company count of 8 in the results, and both sites as small', async () => {
    const company = await as.safety.agent.get(`/api/runs/${runId}/results`).query({ outcomeId: c.outcomes.EDGE, window: 'month' }).expect(200);
    const exp = runResultSchema.array().parse(company.body).find((r) => r.exposureGroupId === c.groups.EXP)!;
    expect(exp).toMatchObject({ cases: null, withheld: 'complement' });
    for (const site of c.sites) {
      const own = await as.safety.agent.get(`/api/runs/${runId}/results`).query({ outcomeId: c.outcomes.EDGE, window: 'month', siteId: site }).expect(200);
      expect(runResultSchema.array().parse(own.body).find((r) => r.exposureGroupId === c.groups.EXP)).toMatchObject({ cases: null, withheld: 'small' });
    }
  });

  it('withholds it in the flag too, except from the physician', async () => {
    const seen = flagSchema.parse((await as.safety.agent.get(`/api/flags/${flagId}`).expect(200)).body);
    expect(seen.figures).toMatchObject({ suppressed: true, withheld: 'complement', cases: null, value: null });
    const listed = flagSchema.array().parse((await as.safety.agent.get('/api/flags').expect(200)).body).find((f) => f.id === flagId)!;
    expect(listed.figures).toMatchObject({ suppressed: true, cases: null });
    const open = flagSchema.parse((await as.physician.agent.get(`/api/flags/${flagId}`).expect(200)).body);
    expect(open.figures).toMatchObject({ suppressed: false, cases: 8 });
  });
});

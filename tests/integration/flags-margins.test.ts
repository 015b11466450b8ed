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
 * (4 + 4 = 8 with the threshold 5: both sites shown as "<5", so each must be 4), and the company's
 * months are shown (8 is not small), the sites' counts go unlabelled ('months': 8 = a + b says
 * nothing of a), in the results; the company's 8 stands, and so does the flag that reports it
 * (worked out by hand).
 */
describe('the site margin of a shown company count', () => {
  let ds: DataSource;
  let c: Cohort;
  let runId: string;
  let flagId: string;
  let as: Record<'safety' | 'physician', SignedInAgent>;

  beforeAll(async () => {
    ds = await openTestDataSource();
    await clearCohortData(ds);
    c = await makeCohort(ds, {
      groups: [
        ['REF', 0],
        ['EXP', 1],
      ],
      reference: 'REF',
      outcomes: [['EDGE', 'recurrent']],
    });
    const rows: Array<[number, string, number, number, number]> = [];
    const cases: Array<[number, number, string]> = [];
    for (const [s, site] of c.sites.entries()) {
      for (let i = 0; i < 6; i++) {
        const e = await c.worker(`e${s}-${i}`, 1980, 'F');
        const r = await c.worker(`r${s}-${i}`, 1980, 'M');
        rows.push([e, '2031-12-01', site, c.groups.EXP!, 160], [r, '2031-12-01', site, c.groups.REF!, 160]);
        if (i < 4) cases.push([e, c.outcomes.EDGE!, '2031-12-05']);
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

  it('shows the company count of 8 and leaves both sites unlabelled, in every window', async () => {
    for (const window of ['month', 'rolling12']) {
      const company = await as.safety.agent.get(`/api/runs/${runId}/results`).query({ outcomeId: c.outcomes.EDGE, window }).expect(200);
      const exp = runResultSchema
        .array()
        .parse(company.body)
        .find((r) => r.exposureGroupId === c.groups.EXP)!;
      expect(exp).toMatchObject({ cases: 8, withheld: null });
      for (const site of c.sites) {
        const own = await as.safety.agent.get(`/api/runs/${runId}/results`).query({ outcomeId: c.outcomes.EDGE, window, siteId: site }).expect(200);
        expect(
          runResultSchema
            .array()
            .parse(own.body)
            .find((r) => r.exposureGroupId === c.groups.EXP),
        ).toMatchObject({ cases: null, withheld: 'months' });
        const physician = await as.physician.agent.get(`/api/runs/${runId}/results`).query({ outcomeId: c.outcomes.EDGE, window, siteId: site }).expect(200);
        expect(
          runResultSchema
            .array()
            .parse(physician.body)
            .find((r) => r.exposureGroupId === c.groups.EXP),
        ).toMatchObject({ cases: 4, withheld: null });
      }
    }
  });

  it('the rule (stored with a minimum of 2, run at 5) flags the shown 8, with its figures for every reader of all sites', async () => {
    const seen = flagSchema.parse((await as.safety.agent.get(`/api/flags/${flagId}`).expect(200)).body);
    expect(seen.figures).toMatchObject({ suppressed: false, withheld: null, cases: 8 });
    const open = flagSchema.parse((await as.physician.agent.get(`/api/flags/${flagId}`).expect(200)).body);
    expect(open.figures).toMatchObject({ cases: 8 });
  });
});

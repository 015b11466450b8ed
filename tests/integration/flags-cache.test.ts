import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createApp } from '@ratewarden/api/app';
import { flagSchema, type Flag } from '@ratewarden/shared/flags';
import { performRun } from '@ratewarden/worker/runs/perform-run';
import { provisionUser, signIn, type SignedInAgent } from '../support/sign-in';
import { testApiConfig } from '../support/test-config';
import { allSiteIds, openTestDataSource } from '../support/test-db';
import { clearCohortData, makeCohort, settings, type Cohort } from './runs-fixture';

/**
 * The flag list is kept per reader under the current run and the `flags` counter of
 * data_versions: a reader's cached answer never reaches a reader of another role or other sites
 * (a count of 2 is withheld from everyone but the physician; small-count withholding is common
 * practice), and every write of flags or rules, by the API or straight in the database as the
 * worker writes, changes the answer at once (no 304 for the old tag).
 */
describe('flag list: kept per reader and data version', () => {
  let ds: DataSource;
  let c: Cohort;
  let runId: string;
  let ruleId: string;
  const flagIds: string[] = [];
  const as = {} as Record<'physician' | 'hygienist' | 'siteOne', SignedInAgent>;

  const run = async () => {
    const o = await performRun(ds, { trigger: 'cli', settings, appUrl: 'http://127.0.0.1/' });
    if (o.status !== 'succeeded') throw new Error(`run ${o.status}`);
    return o.runId;
  };
  const list = async (who: SignedInAgent) => {
    const res = await who.agent.get('/api/flags').expect(200);
    return { tag: res.headers.etag as string, flags: (res.body as unknown[]).map((f) => flagSchema.parse(f)).filter((f) => f.ruleId === ruleId) };
  };
  const casesBySite = (flags: Flag[]) => Object.fromEntries(flags.map((f) => [f.siteId, f.figures.cases]));

  beforeAll(async () => {
    ds = await openTestDataSource();
    await clearCohortData(ds);
    c = await makeCohort(ds, {
      groups: [
        ['REF', 0],
        ['EXP', 1],
      ],
      reference: 'REF',
      outcomes: [['CAC', 'recurrent']],
    });
    const rows: Array<[number, string, number, number, number]> = [];
    for (let i = 0; i < 6; i++) {
      for (const site of c.sites) {
        rows.push([await c.worker(`e${site}-${i}`, 1980, 'M'), '2031-12-01', site, c.groups.EXP!, 160]);
        rows.push([await c.worker(`r${site}-${i}`, 1980, 'F'), '2031-12-01', site, c.groups.REF!, 160]);
      }
    }
    await c.roster(rows);
    runId = await run();
    // A rule (inactive, so the runs leave its flags alone) and a flag at each site with 2 cases, as a run would store them.
    const [rule] = (await ds.query(
      `INSERT INTO watch_rules (name, outcome_id, measure, threshold_on, threshold, window_kind, active) VALUES ('Cached list rule', $1, 'rate', 'estimate', 1, 'month', false) RETURNING id`,
      [c.outcomes.CAC],
    )) as Array<{ id: string }>;
    ruleId = rule!.id;
    for (const site of c.sites) {
      const figures = {
        runId,
        period: '2031-12-01',
        window: 'month',
        measure: 'rate',
        thresholdOn: 'estimate',
        threshold: 1,
        value: 1250,
        estimate: 1250,
        lower: 151,
        upper: 4515,
        cases: 2,
        expected: null,
        personTime: 1.6,
        p: null,
        q: null,
        personTimeBasis: 'person_years',
        per: 1000,
      };
      const [f] = (await ds.query(
        `INSERT INTO flags (rule_id, outcome_id, exposure_group_id, site_id, raised_run_id, last_run_id, period, value, worst_value, detail)
         VALUES ($1, $2, $3, $4, $5, $5, '2031-12-01', 1250, 1250, $6) RETURNING id`,
        [ruleId, c.outcomes.CAC, c.groups.EXP, site, runId, JSON.stringify(figures)],
      )) as Array<{ id: string }>;
      flagIds.push(f!.id);
    }
    const app = createApp({ dataSource: ds, config: testApiConfig() });
    await provisionUser(ds, 'physician@demo.ratewarden.test', 'physician', await allSiteIds(ds));
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', await allSiteIds(ds));
    await provisionUser(ds, 'safety@demo.ratewarden.test', 'safety_manager', [c.sites[0]!]);
    as.physician = await signIn(app, 'physician@demo.ratewarden.test');
    as.hygienist = await signIn(app, 'hygienist@demo.ratewarden.test');
    as.siteOne = await signIn(app, 'safety@demo.ratewarden.test');
  });
  afterAll(async () => {
    await ds?.destroy();
  });

  it("never gives one reader another's kept list, whoever asks first", async () => {
    const [one, two] = c.sites as [number, number];
    for (let round = 0; round < 2; round++) {
      const physician = await list(as.physician);
      const hygienist = await list(as.hygienist);
      const siteOne = await list(as.siteOne);
      expect(casesBySite(physician.flags)).toEqual({ [one]: 2, [two]: 2 });
      expect(casesBySite(hygienist.flags)).toEqual({ [one]: null, [two]: null });
      expect(hygienist.flags.every((f) => f.figures.suppressed && f.value === null)).toBe(true);
      expect(casesBySite(siteOne.flags)).toEqual({ [one]: null });
      expect(new Set([physician.tag, hygienist.tag, siteOne.tag]).size).toBe(3);
    }
    // The reader of site one, asked first this time, still sees site one only; the physician still every count.
    await ds.query(`UPDATE flags SET updated_at = now() WHERE rule_id = $1`, [ruleId]);
    expect(casesBySite((await list(as.siteOne)).flags)).toEqual({ [one]: null });
    expect(casesBySite((await list(as.physician)).flags)).toEqual({ [one]: 2, [two]: 2 });
  });

  it('answers 304 for the tag it gave, and a new answer at once after a review through the API', async () => {
    const before = await list(as.siteOne);
    await as.siteOne.agent.get('/api/flags').set('if-none-match', before.tag).expect(304);
    const physicianBefore = await list(as.physician);
    const hygienistBefore = await list(as.hygienist);
    // The safety manager reviews the flag of their site.
    await as.siteOne.agent.post(`/api/flags/${flagIds[0]}/review`).set('x-csrf-token', as.siteOne.csrf).send({}).expect(200);
    const res = await as.siteOne.agent.get('/api/flags').set('if-none-match', before.tag).expect(200);
    expect(res.headers.etag).not.toBe(before.tag);
    await as.hygienist.agent.get('/api/flags').set('if-none-match', hygienistBefore.tag).expect(200);
    const after = await list(as.physician);
    expect(after.tag).not.toBe(physicianBefore.tag);
    expect(after.flags.find((f) => f.id === flagIds[0])!.state).toBe('in_review');
    expect((await list(as.hygienist)).flags.find((f) => f.id === flagIds[0])!.state).toBe('in_review');
  });

  it('changes at once when another process writes flags or rules straight in the database', async () => {
    const before = await list(as.hygienist);
    await ds.query(`UPDATE watch_rules SET name = 'Renamed elsewhere' WHERE id = $1`, [ruleId]);
    await as.hygienist.agent.get('/api/flags').set('if-none-match', before.tag).expect(200);
    expect((await list(as.hygienist)).flags.map((f) => f.ruleName)).toEqual(['Renamed elsewhere', 'Renamed elsewhere']);
    await ds.query(`UPDATE flags SET state = 'closed', close_reason = 'explained', closed_at = now() WHERE id = $1`, [flagIds[1]]);
    expect((await list(as.physician)).flags.find((f) => f.id === flagIds[1])!.state).toBe('closed');
  });

  it('is answered anew once another run is current', async () => {
    const before = await list(as.physician);
    expect(before.flags.every((f) => f.figures.cases === 2)).toBe(true);
    await run();
    const after = await list(as.physician);
    expect(after.tag).not.toBe(before.tag);
    // For everyone else a flag of an earlier run keeps its figures withheld.
    expect((await list(as.hygienist)).flags.every((f) => f.figures.withheld === 'earlier')).toBe(true);
  });
});

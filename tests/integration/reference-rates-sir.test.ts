import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import chisquareQuantile from '@stdlib/stats-base-dists-chisquare-quantile';
import normalQuantile from '@stdlib/stats-base-dists-normal-quantile';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createApp } from '@ratewarden/api/app';
import { referenceTableSchema, sirAnswerSchema, type SirRow } from '@ratewarden/shared/reference-rates';
import { performRun } from '@ratewarden/worker/runs/perform-run';
import { provisionUser, signIn, type SignedInAgent } from '../support/sign-in';
import { testApiConfig } from '../support/test-config';
import { allSiteIds, openTestDataSource } from '../support/test-db';
import { clearCohortData, makeCohort, settings, type Cohort } from './runs-fixture';

/**
 * The SIR end to end: reference rates through their intake, a roster and cases, a run, and the
 * SIR read through the API, against a published worked example of indirect standardization
 * (tests/fixtures/reference-rates/indirect-standardization-example.json, source named there:
 * SAS/STAT User's Guide, PROC STDRATE "Getting Started", Florida vs United States skin cancer
 * 2000). The intervals are checked against the textbook formulas with stdlib's quantile functions:
 * exact limits from chi-square quantiles (Garwood 1936; Ulm 1990), Byar's approximation
 * (Rothman & Boice 1979).
 */
interface Stratum {
  band: string;
  ageFrom: number;
  ageTo: number;
  studyPersonYears: number;
  observed: number;
  referenceEvents: number;
  referencePersonYears: number;
}
const example = JSON.parse(readFileSync(join(import.meta.dirname, '..', 'fixtures', 'reference-rates', 'indirect-standardization-example.json'), 'utf8')) as {
  scale: number;
  strata: Stratum[];
  expectedByStratum: number[];
  expectedTotal: number;
  published: { observed: number; smr: number };
};
const YEAR = 2000;
/** Every band's workers are this old in 2000 (a mid-band age; the table's top band is 85–120). */
const ageOf = (s: Stratum) => Math.min(s.ageFrom + 5, s.ageTo);
const HOURS_PER_ROW = 600;

const relClose = (actual: number | string | null, expected: number, rel: number) => {
  expect(typeof actual).toBe('number');
  expect(Math.abs((actual as number) - expected)).toBeLessThanOrEqual(rel * Math.abs(expected));
};

function referenceCsv(outcomeCode: string, extra: string[] = []): string {
  const lines = ['outcome,sex,age_from,age_to,year,rate_per_person_year,source'];
  for (const s of example.strata) {
    // Scaled: the study's person-years ÷ scale, so the reference rates × scale (E unchanged).
    const rate = ((s.referenceEvents / s.referencePersonYears) * example.scale).toFixed(12);
    for (const sex of ['F', 'M']) lines.push(`${outcomeCode},${sex},${s.ageFrom},${s.ageTo},${YEAR},${rate},"US 2000, Minino et al. 2002 (published example)"`);
  }
  return [...lines, ...extra].join('\n') + '\n';
}

describe('reference rates and the SIR of a run', () => {
  let ds: DataSource;
  let c: Cohort;
  let as: Record<'hygienist' | 'safety' | 'physician', SignedInAgent>;
  let stratumGroups: number[];

  const upload = (who: SignedInAgent, csv: string, name = 'reference-rates.csv') =>
    who.agent.post('/api/reference-rates').set('x-csrf-token', who.csrf).attach('file', Buffer.from(csv), { filename: name, contentType: 'text/csv' });
  const sirOf = async (who: SignedInAgent, siteId?: number) => {
    const res = await who.agent
      .get('/api/reference-rates/runs/current/sir')
      .query({ outcomeId: c.outcomes.SKIN, ...(siteId ? { siteId } : {}) })
      .expect(200);
    return sirAnswerSchema.parse(res.body);
  };

  beforeAll(async () => {
    ds = await openTestDataSource();
    await clearCohortData(ds);
    await ds.query(`TRUNCATE reference_rate_tables CASCADE`);
    const groups: Array<[string, number | null]> = [['REF', 0], ['ALL', 1], ['FEW', 2], ...example.strata.map((_s, i) => [`S${i}`, null] as [string, null])];
    c = await makeCohort(ds, { groups, reference: 'REF', outcomes: [['SKIN', 'recurrent']] });
    stratumGroups = example.strata.map((_s, i) => c.groups[`S${i}`]!);

    // Site one: every stratum in one group (ALL). Site two: each stratum in a group of its own
    // (S0 … S9), other workers, so that each group's expected count is one stratum's.
    const roster: Array<[number, string, number, number, number]> = [];
    const cases: Array<[number, number, string]> = [];
    let key = 0;
    const place = async (s: Stratum, site: number, group: number) => {
      let hours = Math.round((s.studyPersonYears / example.scale) * 2000 * 100) / 100;
      const rows: Array<[number, string]> = [];
      let worker = 0;
      let month = 12;
      while (hours > 0) {
        if (month === 12) {
          worker = await c.worker(`w${key++}`, YEAR - ageOf(s), 'M');
          month = 0;
        }
        month++;
        const h = Math.min(HOURS_PER_ROW, Math.round(hours * 100) / 100);
        const m = `${YEAR}-${String(month).padStart(2, '0')}-01`;
        roster.push([worker, m, site, group, h]);
        rows.push([worker, m]);
        hours = Math.round((hours - h) * 100) / 100;
      }
      for (let i = 0; i < s.observed; i++) {
        const [w, m] = rows[i % rows.length]!;
        cases.push([w, c.outcomes.SKIN!, m.replace(/-01$/, '-15')]);
      }
    };
    for (const [i, s] of example.strata.entries()) {
      await place(s, c.sites[0]!, c.groups.ALL!);
      await place(s, c.sites[1]!, stratumGroups[i]!);
    }
    // A small group for the disclosure rules: 3 cases at site two.
    const few = await c.worker('few', 1980, 'F');
    for (let m = 1; m <= 12; m++) roster.push([few, `${YEAR}-${String(m).padStart(2, '0')}-01`, c.sites[1]!, c.groups.FEW!, 160]);
    for (const d of ['2000-02-10', '2000-05-10', '2000-09-10']) cases.push([few, c.outcomes.SKIN!, d]);
    await c.roster(roster);
    await c.cases(cases.map(([w, o, d]) => [w, o, d]));

    const allSites = await allSiteIds(ds);
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', allSites);
    await provisionUser(ds, 'safety@demo.ratewarden.test', 'safety_manager', allSites);
    await provisionUser(ds, 'physician@demo.ratewarden.test', 'physician', allSites);
    const app = createApp({ dataSource: ds, config: testApiConfig() });
    as = {
      hygienist: await signIn(app, 'hygienist@demo.ratewarden.test'),
      safety: await signIn(app, 'safety@demo.ratewarden.test'),
      physician: await signIn(app, 'physician@demo.ratewarden.test'),
    };
  }, 120_000);
  afterAll(async () => {
    await ds.destroy();
  });

  it('rejects a file with problems whole, naming line and column, and keeps nothing of it', async () => {
    const bad = referenceCsv(`SKIN${c.tag}`, [
      `NOPE${c.tag},F,0,4,2001,0.001,x`, // unknown outcome
      `SKIN${c.tag},F,30,20,2001,0.001,x`, // band reversed
      `SKIN${c.tag},M,0,10,${YEAR},0.001,x`, // overlaps 0–4 and 5–14 of the same sex and year
      `SKIN${c.tag},F,0,4,2002,abc,x`, // not a number
    ]);
    const res = await upload(as.hygienist, bad, 'bad.csv').expect(422);
    expect(res.body.code).toBe('validation_failed');
    const table = referenceTableSchema.parse(res.body.details.table);
    expect(table).toMatchObject({ state: 'rejected', rowCount: 0, problemCount: 4 });
    const first = example.strata.length * 2 + 2; // header is line 1
    expect(table.problems.map((p) => [p.line, p.column])).toEqual([
      [first, 'outcome'],
      [first + 1, 'age_to'],
      [first + 2, 'age_from'],
      [first + 3, 'rate_per_person_year'],
    ]);
    expect(Number((await ds.query(`SELECT count(*) AS n FROM reference_rates WHERE table_id = $1`, [table.id]))[0].n)).toBe(0);
    await upload(as.hygienist, 'outcome,sex\nX,F\n', 'short.csv').expect(422);
    // Uploads are the hygienist's.
    await upload(as.safety, referenceCsv(`SKIN${c.tag}`)).expect(403);
  });

  it('applies a good file as a version, supersedes the earlier one and keeps it with its rows', async () => {
    const older = await upload(as.hygienist, referenceCsv(`SKIN${c.tag}`).replace(/,2000,/g, ',1999,'), 'older.csv').expect(201);
    const v1 = referenceTableSchema.parse(older.body.table);
    const res = await upload(as.hygienist, referenceCsv(`SKIN${c.tag}`)).expect(201);
    const v2 = referenceTableSchema.parse(res.body.table);
    expect(v2).toMatchObject({ state: 'applied', rowCount: example.strata.length * 2, yearFrom: YEAR, yearTo: YEAR, outcomeCodes: [`SKIN${c.tag}`] });
    // The same bytes again change nothing.
    expect((await upload(as.hygienist, referenceCsv(`SKIN${c.tag}`)).expect(200)).body.table.id).toBe(v2.id);
    const list = referenceTableSchema.array().parse((await as.safety.agent.get('/api/reference-rates').expect(200)).body);
    expect(list.find((t) => t.id === v1.id)).toMatchObject({ state: 'superseded', rowCount: example.strata.length * 2 });
    expect(list.filter((t) => t.state === 'applied').map((t) => t.id)).toEqual([v2.id]);
    const old = await as.safety.agent.get('/api/reference-rates/rates').query({ version: v1.id }).expect(200);
    expect(old.body.rates).toHaveLength(example.strata.length * 2);
    expect(old.body.rates[0].year).toBe(1999);
    const audit = await ds.query(`SELECT action FROM audit_events WHERE target = $1`, [`reference_rates:${v2.id}`]);
    expect(audit.map((a: { action: string }) => a.action)).toEqual(['reference.apply']);
    expect(Number((await ds.query(`SELECT count(*) AS n FROM run_requests WHERE picked_at IS NULL AND reason LIKE 'reference rates%'`))[0].n)).toBeGreaterThan(
      0,
    );
  });

  describe('after a run', () => {
    let physician: Map<number, SirRow>;
    let safety: Map<number, SirRow>;
    const rules: Record<string, string> = {};
    beforeAll(async () => {
      // Watch rules on the SIR, written through the API by the safety manager.
      const rule = async (name: string, group: number, threshold: number) => {
        const res = await as.safety.agent
          .post('/api/rules')
          .set('x-csrf-token', as.safety.csrf)
          .send({ name, outcomeId: c.outcomes.SKIN, exposureGroupId: group, measure: 'sir', thresholdOn: 'lower_bound', threshold, fdrControl: false })
          .expect(201);
        rules[name] = res.body.id as string;
      };
      await rule('SIR lower limit above 0.5', c.groups.ALL!, 0.5);
      await rule('SIR lower limit above 1', c.groups.ALL!, 1);
      await rule('SIR of a small group', c.groups.FEW!, 0);
      const outcome = await performRun(ds, { trigger: 'cli', settings, appUrl: 'http://127.0.0.1/' });
      expect(outcome.status).toBe('succeeded');
      physician = new Map((await sirOf(as.physician)).rows.map((r) => [r.exposureGroupId, r]));
      safety = new Map((await sirOf(as.safety)).rows.map((r) => [r.exposureGroupId, r]));
    }, 120_000);

    it('reproduces the expected count of each stratum (computed from the published inputs)', () => {
      example.strata.forEach((s, i) => {
        const row = physician.get(stratumGroups[i]!)!;
        expect(row.observed).toBe(s.observed);
        // The fixture's stratum values are rounded to 6 decimals; the full value from the inputs is checked tighter.
        expect(Math.abs(row.expected - example.expectedByStratum[i]!)).toBeLessThanOrEqual(5e-7);
        // 1e-8: the file carries each rate to 12 decimals (2.4e-4 × 10,000 loses about 2e-9 of it).
        if (s.referenceEvents > 0) relClose(row.expected, (s.studyPersonYears * s.referenceEvents) / s.referencePersonYears, 1e-8);
        else expect(row.expected).toBe(0);
        relClose(row.personYears, s.studyPersonYears / example.scale, 1e-9);
        expect(row.personYearsUncovered).toBe(0);
      });
    });

    it('reproduces the published SMR (538 observed, 1.0175) with exact and Byar limits by their formulas', () => {
      const all = physician.get(c.groups.ALL!)!;
      expect(all.observed).toBe(example.published.observed); // published
      relClose(all.expected, example.expectedTotal, 1e-6); // from the published inputs
      expect(Math.abs(all.sir! - example.published.smr)).toBeLessThan(0.00005); // published SMR, 4 decimals (from memory)
      // E at full precision from the published inputs (the fixture's total is rounded to 6 decimals).
      const e = example.strata.reduce((t, s) => t + (s.studyPersonYears * s.referenceEvents) / s.referencePersonYears, 0);
      const [o, z] = [538, normalQuantile(0.975, 0, 1)];
      relClose(all.expected, e, 1e-9);
      relClose(all.exact.lower, chisquareQuantile(0.025, 2 * o) / 2 / e, 1e-6); // Garwood 1936 / Ulm 1990
      relClose(all.exact.upper, chisquareQuantile(0.975, 2 * o + 2) / 2 / e, 1e-6);
      relClose(all.exact.lower, 0.93336265, 1e-6); // scipy 1.10 chi2.ppf(0.025, 1076) / 2 / E
      relClose(all.byar.lower, (o * (1 - 1 / (9 * o) - z / (3 * Math.sqrt(o))) ** 3) / e, 1e-9); // Rothman & Boice 1979
      relClose(all.byar.upper, ((o + 1) * (1 - 1 / (9 * (o + 1)) + z / (3 * Math.sqrt(o + 1))) ** 3) / e, 1e-9);
      relClose(all.excess, o - e, 1e-9);
      expect(all.confidence).toBe(0.95);
    });

    it('shows the same to the safety manager, but withholds a small observed count with everything that gives it back', () => {
      expect(safety.get(c.groups.ALL!)).toMatchObject({ observed: 538, withheld: null });
      expect(physician.get(c.groups.FEW!)).toMatchObject({ observed: 3, withheld: null });
      const few = safety.get(c.groups.FEW!)!;
      expect(few).toMatchObject({
        observed: null,
        sir: null,
        excess: null,
        withheld: 'small',
        exact: { lower: null, upper: null },
        byar: { lower: null, upper: null },
      });
      expect(few.expected).toBeGreaterThan(0);
      // The 15–24 band has 4 observed: withheld too.
      expect(safety.get(stratumGroups[2]!)).toMatchObject({ observed: null, withheld: 'small' });
      // 25–34: 14 observed, but single months of 1 and 2 cases that the run's frame withholds; the
      // SIR's all-months total beside the shown months would give them back, so it is withheld too.
      expect(physician.get(stratumGroups[3]!)).toMatchObject({ observed: 14, withheld: null });
      expect(safety.get(stratumGroups[3]!)).toMatchObject({ observed: null, sir: null, withheld: 'complement' });
    });

    it('serves a site its own rows, and 403 outside the reader’s sites', async () => {
      const site = await sirOf(as.physician, c.sites[1]);
      expect(site.rows.find((r) => r.exposureGroupId === c.groups.FEW)).toMatchObject({ observed: 3, siteId: c.sites[1] });
      expect(site.rows.find((r) => r.exposureGroupId === c.groups.ALL)).toBeUndefined();
      await provisionUser(ds, 'safety@demo.ratewarden.test', 'safety_manager', [c.sites[0]!]);
      const limited = await signIn(createApp({ dataSource: ds, config: testApiConfig() }), 'safety@demo.ratewarden.test');
      await limited.agent.get('/api/reference-rates/runs/current/sir').expect(403);
      await limited.agent.get('/api/reference-rates/runs/current/sir').query({ siteId: c.sites[1] }).expect(403);
      await limited.agent.get('/api/reference-rates/runs/current/sir').query({ siteId: c.sites[0] }).expect(200);
    });

    it('raises a flag from a rule on the SIR lower limit when it is above the threshold, and not otherwise, nor on a withheld count', async () => {
      const flags = (await ds.query(`SELECT rule_id, exposure_group_id, site_id, value FROM flags WHERE rule_id = ANY($1::uuid[])`, [
        Object.values(rules),
      ])) as Array<{ rule_id: string; exposure_group_id: number; site_id: number | null; value: number }>;
      expect(flags).toHaveLength(1);
      expect(flags[0]).toMatchObject({ rule_id: rules['SIR lower limit above 0.5'], exposure_group_id: c.groups.ALL, site_id: null });
      relClose(flags[0]!.value, physician.get(c.groups.ALL!)!.exact.lower as number, 1e-12); // the exact lower limit checked above
    });

    it('takes its confidence level from the analysis settings version the run used (90 %)', async () => {
      const before = (await as.hygienist.agent.get('/api/settings').expect(200)).body.current.settings;
      const withConfidence = (confidence: number) => ({
        personTimeBasis: before.personTimeBasis,
        per: before.per,
        confidence,
        countedStatuses: before.countedStatuses,
        ageBandEdges: before.ageBandEdges,
      });
      const put = (body: object) => as.hygienist.agent.put('/api/settings').set('x-csrf-token', as.hygienist.csrf).send(body).expect(200);
      await put(withConfidence(0.9));
      const outcome = await performRun(ds, { trigger: 'cli', settings, appUrl: 'http://127.0.0.1/' }).finally(() => put(withConfidence(before.confidence)));
      expect(outcome.status).toBe('succeeded');
      const all = (await sirOf(as.physician)).rows.find((r) => r.exposureGroupId === c.groups.ALL)!;
      expect(all.confidence).toBe(0.9);
      const e = all.expected;
      relClose(all.exact.lower as number, chisquareQuantile(0.05, 2 * 538) / 2 / e, 1e-6); // Garwood 1936 / Ulm 1990, at 90 %
      relClose(all.exact.upper as number, chisquareQuantile(0.95, 2 * 538 + 2) / 2 / e, 1e-6);
    });

    it("gives an earlier run's SIR to the physician only, as every run figure (two runs side by side would give back withheld counts)", async () => {
      const [{ run_id: earlier }] = (await ds.query(`SELECT run_id::text FROM current_run`)) as [{ run_id: string }];
      expect((await performRun(ds, { trigger: 'cli', settings, appUrl: 'http://127.0.0.1/' })).status).toBe('succeeded');
      await as.hygienist.agent.get(`/api/reference-rates/runs/${earlier}/sir`).expect(403);
      await as.physician.agent.get(`/api/reference-rates/runs/${earlier}/sir`).expect(200);
      await as.hygienist.agent.get('/api/reference-rates/runs/current/sir').expect(200);
    });
  });
});

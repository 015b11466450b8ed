import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createApp } from '@ratewarden/api/app';
import { caseSummarySchema, type CaseSummary } from '@ratewarden/shared/cases';
import { performRun } from '@ratewarden/worker/runs/perform-run';
import { provisionUser, signIn, type SignedInAgent } from '../support/sign-in';
import { testApiConfig } from '../support/test-config';
import { allSiteIds, openTestDataSource } from '../support/test-db';
import { clearCohortData, makeCohort, settings, storedResults, type Cohort } from './runs-fixture';

/**
 * One attribution rule read by three processes (db/src/case-attribution.ts): the run's counts
 * (worker), the case register and the cases behind a flag (api) must agree. A hand-built roster
 * where the rule matters at every step, months of 2031, sites S0 (lower id) and S1:
 *   FE: first-event outcome, lag 1 month; RC: recurrent outcome, lag 2 months.
 *   a: Jan S0 EXP 100 h and S1 REF 60 h (two groups in one month, different hours), Feb–Jun S1 REF 100 h.
 *      FE cases 10 Feb and 20 Feb (same month: the first event is the earlier one) and 3 Apr (later: not counted).
 *   b: Feb S0 EXP 80 h and S1 REF 80 h (a tie: the lower site id, S0, EXP), Jan and Mar–Jun S1 REF 100 h. FE case 5 Mar.
 *   d: Mar S1 EXP 50 h and S0 REF 120 h (most hours: REF), other months S1 EXP 100 h. RC cases 1 May and 20 May.
 *   e: rostered from Mar only (S1 REF 100 h). RC case 10 Apr: its roster month is Feb, none: unattributed.
 *   f: S0 EXP 100 h every month. RC case 15 Jun → Apr → EXP.
 * Expected attribution worked out by hand from the rule (common practice: exposure lag, one row per case).
 */
describe('case attribution: the run, the case register and a flag’s cases agree', () => {
  let ds: DataSource;
  let c: Cohort;
  let app: ReturnType<typeof createApp>;
  let physician: SignedInAgent;
  let runId: string;
  let register: CaseSummary[];
  const w: Record<string, number> = {};
  const ref: Record<string, string> = {};

  beforeAll(async () => {
    ds = await openTestDataSource();
    await clearCohortData(ds);
    c = await makeCohort(ds, {
      groups: [
        ['REF', 0],
        ['EXP', 1],
      ],
      reference: 'REF',
      outcomes: [
        ['FE', 'first_event', 1],
        ['RC', 'recurrent', 2],
      ],
    });
    const [s0, s1] = c.sites as [number, number];
    const { EXP, REF } = c.groups as { EXP: number; REF: number };
    for (const k of ['a', 'b', 'd', 'e', 'f']) w[k] = await c.worker(k, 1980, 'F');
    const months = ['01', '02', '03', '04', '05', '06'].map((m) => `2031-${m}-01`);
    const rows: Array<[number, string, number, number, number]> = [];
    for (const m of months) {
      if (m === '2031-01-01') rows.push([w.a!, m, s0, EXP, 100], [w.a!, m, s1, REF, 60]);
      else rows.push([w.a!, m, s1, REF, 100]);
      if (m === '2031-02-01') rows.push([w.b!, m, s0, EXP, 80], [w.b!, m, s1, REF, 80]);
      else rows.push([w.b!, m, s1, REF, 100]);
      if (m === '2031-03-01') rows.push([w.d!, m, s1, EXP, 50], [w.d!, m, s0, REF, 120]);
      else rows.push([w.d!, m, s1, EXP, 100]);
      if (m >= '2031-03-01') rows.push([w.e!, m, s1, REF, 100]);
      rows.push([w.f!, m, s0, EXP, 100]);
    }
    // One intake holds one row per worker and month: site S1's slices come from an intake of their own.
    await c.roster(rows.filter((r) => r[2] === s0));
    const [s1Intake] = (await ds.query(
      `INSERT INTO intakes (kind, state, file_name, checksum, size_bytes, site_ids, submitted_by_client, applied_at)
       VALUES ('roster', 'applied', 'roster-s1.csv', md5(random()::text) || md5(random()::text), 1, $1, 'run-tests', now()) RETURNING id`,
      [[s1]],
    )) as Array<{ id: string }>;
    const s1Rows = rows.filter((r) => r[2] === s1);
    await ds.query(
      `INSERT INTO roster_entries (intake_id, worker_id, month, site_id, exposure_group_id, hours)
       SELECT $1, w, m, $2, g, h FROM unnest($3::bigint[], $4::date[], $5::int[], $6::numeric[]) AS x(w, m, g, h)`,
      [s1Intake!.id, s1, s1Rows.map((r) => r[0]), s1Rows.map((r) => r[1]), s1Rows.map((r) => r[3]), s1Rows.map((r) => r[4])],
    );
    await ds.query(`INSERT INTO roster_slices (site_id, month, intake_id) SELECT DISTINCT site_id, month, intake_id FROM roster_entries WHERE intake_id = $1`, [
      s1Intake!.id,
    ]);
    const cases: Array<[string, number, number, string]> = [
      ['a1', w.a!, c.outcomes.FE!, '2031-02-10'],
      ['a2', w.a!, c.outcomes.FE!, '2031-02-20'],
      ['a3', w.a!, c.outcomes.FE!, '2031-04-03'],
      ['b1', w.b!, c.outcomes.FE!, '2031-03-05'],
      ['d1', w.d!, c.outcomes.RC!, '2031-05-01'],
      ['d2', w.d!, c.outcomes.RC!, '2031-05-20'],
      ['e1', w.e!, c.outcomes.RC!, '2031-04-10'],
      ['f1', w.f!, c.outcomes.RC!, '2031-06-15'],
    ];
    await c.cases(cases.map(([, worker, outcome, onset]) => [worker, outcome, onset]));
    // makeCohort numbers the case references in insertion order.
    cases.forEach(([name], i) => (ref[name] = `${c.tag}-C${i + 1}`));

    const outcome = await performRun(ds, { trigger: 'cli', settings, appUrl: 'http://127.0.0.1:3000' });
    expect(outcome.status).toBe('succeeded');
    runId = (outcome as { runId: string }).runId;

    await provisionUser(ds, 'physician@demo.ratewarden.test', 'physician', await allSiteIds(ds));
    app = createApp({ dataSource: ds, config: testApiConfig() });
    physician = await signIn(app, 'physician@demo.ratewarden.test');
    const res = await physician.agent.get(`/api/cases`).query({ q: c.tag, limit: 100 }).expect(200);
    register = (res.body as unknown[]).map((x) => caseSummarySchema.parse(x));
  });
  afterAll(async () => {
    await ds?.destroy();
  });

  const entry = (name: string) => register.find((x) => x.caseRef === ref[name])!;

  it.each([
    // [case, site index, group, state] from the rule, by hand
    ['a1', 0, 'EXP', 'attributed'], // Feb − 1 = Jan: S0 EXP 100 h beats S1 REF 60 h
    ['a2', 0, 'EXP', 'not_counted'], // same month as a1, later: first event only
    ['a3', 1, 'REF', 'not_counted'], // Apr − 1 = Mar: S1 REF; a later event
    ['b1', 0, 'EXP', 'attributed'], // Mar − 1 = Feb: 80 h each, the lower site id S0
    ['d1', 0, 'REF', 'attributed'], // May − 2 = Mar: S0 REF 120 h beats S1 EXP 50 h
    ['d2', 0, 'REF', 'attributed'], // recurrent: counted too
    ['e1', null, null, 'unattributed'], // Apr − 2 = Feb: no roster row
    ['f1', 0, 'EXP', 'attributed'], // Jun − 2 = Apr: S0 EXP
  ] as const)('the register attributes %s to site %s, group %s (%s)', (name, site, group, state) => {
    const e = entry(name);
    expect(e.siteId).toBe(site === null ? null : c.sites[site]);
    expect(e.exposureGroupId).toBe(group === null ? null : c.groups[group]);
    expect(e.attribution.state).toBe(state);
    expect(e.attribution.runId).toBe(runId);
  });

  it('the run counts, per outcome × group × month, exactly the cases the register shows attributed', async () => {
    const byKey = new Map<string, number>();
    for (const e of register.filter((x) => x.attribution.state === 'attributed')) {
      const key = `${e.outcomeId}:${e.exposureGroupId}:${e.onsetDate.slice(0, 7)}`;
      byKey.set(key, (byKey.get(key) ?? 0) + 1);
    }
    // Worked out by hand: FE EXP Feb 1 (a1), FE EXP Mar 1 (b1); RC REF May 2 (d1, d2), RC EXP Jun 1 (f1).
    expect(Object.fromEntries(byKey)).toEqual({
      [`${c.outcomes.FE}:${c.groups.EXP}:2031-02`]: 1,
      [`${c.outcomes.FE}:${c.groups.EXP}:2031-03`]: 1,
      [`${c.outcomes.RC}:${c.groups.REF}:2031-05`]: 2,
      [`${c.outcomes.RC}:${c.groups.EXP}:2031-06`]: 1,
    });
    for (const outcome of [c.outcomes.FE!, c.outcomes.RC!]) {
      const results = await storedResults(ds, runId, outcome);
      for (const [key, r] of results) {
        const [group, window, month] = key.split(':');
        if (window !== 'month') continue;
        expect([key, r.cases]).toEqual([key, byKey.get(`${outcome}:${group}:${month}`) ?? 0]);
      }
    }
    const [unattributed] = (await ds.query(`SELECT count(*)::int AS n FROM run_unattributed WHERE run_id = $1 AND outcome_id = $2`, [
      runId,
      c.outcomes.RC,
    ])) as Array<{ n: number }>;
    expect(unattributed!.n).toBe(1); // e1
  });

  it.each([
    // [outcome, group, period, window, cases behind the flag] by hand
    ['FE', 'EXP', '2031-03-01', 'rolling12', ['a1', 'b1']],
    ['FE', 'REF', '2031-06-01', 'rolling12', []], // a3 falls in REF but is a later event
    ['RC', 'REF', '2031-05-01', 'month', ['d1', 'd2']],
    ['RC', 'EXP', '2031-06-01', 'month', ['f1']],
  ] as const)('a flag on %s × %s (%s, %s) lists the cases the run counted there', async (outcome, group, period, window, expected) => {
    const [rule] = (await ds.query(
      `INSERT INTO watch_rules (name, outcome_id, measure, threshold_on, threshold, window_kind, active) VALUES ('attribution test', $1, 'rate', 'estimate', 1, $2, false) RETURNING id`,
      [c.outcomes[outcome], window],
    )) as Array<{ id: string }>;
    const [flag] = (await ds.query(
      `INSERT INTO flags (rule_id, outcome_id, exposure_group_id, raised_run_id, last_run_id, period, value, worst_value, detail)
       VALUES ($1, $2, $3, $4, $4, $5, 1, 1, $6) RETURNING id`,
      [rule!.id, c.outcomes[outcome], c.groups[group], runId, period, JSON.stringify({ window })],
    )) as Array<{ id: string }>;
    const res = await physician.agent.get(`/api/flags/${flag!.id}/cases`).expect(200);
    const listed = (res.body as Array<{ caseRef: string }>).map((x) => x.caseRef);
    expect(listed).toEqual(expected.map((name) => ref[name]));
    // The register's attributed cases in that group and window are the same ones.
    const months = window === 'month' ? 1 : 12;
    const from = new Date(`${period}T00:00:00Z`);
    from.setUTCMonth(from.getUTCMonth() - (months - 1));
    const inWindow = register.filter(
      (x) =>
        x.attribution.state === 'attributed' &&
        x.outcomeId === c.outcomes[outcome] &&
        x.exposureGroupId === c.groups[group] &&
        x.onsetDate.slice(0, 7) >= from.toISOString().slice(0, 7) &&
        x.onsetDate.slice(0, 7) <= period.slice(0, 7),
    );
    expect(inWindow.map((x) => x.caseRef).sort()).toEqual([...listed].sort());
  });
});

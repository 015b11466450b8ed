import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createApp } from '@ratewarden/api/app';
import { flagSchema, mailboxMessageSchema } from '@ratewarden/shared/flags';
import { runDetailSchema, runDiffSchema, type RunResult, type RunSettings, type RunStrata } from '@ratewarden/shared/runs';
import { analysisSettingsSchema } from '@ratewarden/shared/settings';
import { isWindowEnd, offeredWindows, windowKinds } from '@ratewarden/shared/windows';
import { addMonths } from '@ratewarden/shared/periods';
import { auditEventSchema } from '@ratewarden/shared/admin';
import { createTransport, sendDueNotices } from '@ratewarden/worker/notices/notice-sender';
import { currentAnalysisSettings } from '@ratewarden/worker/runs/analysis-settings';
import { performRun } from '@ratewarden/worker/runs/perform-run';
import { startFakeSmtp, type FakeSmtp } from '@ratewarden/worker/smtp-fake/fake-smtp-server';
import { keepInMailbox } from '@ratewarden/worker/smtp-fake/keep-in-mailbox';
import { freePort } from '../support/free-port';
import { provisionUser, signIn, type SignedInAgent } from '../support/sign-in';
import { testApiConfig } from '../support/test-config';
import { allSiteIds, openTestDataSource } from '../support/test-db';
import { makeDisclosureCohort, type DisclosureCohort } from './disclosure-cohort';
import { readResults, readStrata, resultKey, strataKey, type StrataRequest } from './disclosure-reads';
import { differencing, linearAttack, observe, pinnedSmallCounts, truthOf, type Universe } from './disclosure-system';
import { testSender } from './notices-fixture';
import { clearCohortData, settings } from './runs-fixture';

const THRESHOLD = 5;
const isSmall = (n: number) => n > 0 && n < THRESHOLD;

/**
 * A hostile hygienist and safety manager read every figure the API gives them for a run of an
 * invented cohort where many counts are small (disclosure-cohort.ts), and try to work the small
 * ones out: by linear algebra over everything read together, by rolling-window differences, by
 * watch rules at small minimums, by subtracting site tables from company ones, through adjusted
 * measures, the audit log, the mailbox, a partial site assignment and an earlier run. The
 * physician, who sees every count, gives the truth each attack is judged against.
 */
describe('small-count disclosure against a hostile reader', () => {
  let ds: DataSource;
  let dc: DisclosureCohort;
  let u: Universe;
  let firstRun: string;
  let runId: string;
  let as: Record<'physician' | 'hygienist' | 'safety' | 'partial' | 'admin', SignedInAgent>;
  let smtp: FakeSmtp;
  const truth = { results: new Map<string, RunResult>(), strata: new Map<string, RunStrata>() };
  const seen = { results: new Map<string, RunResult>(), strata: new Map<string, RunStrata>() };
  const company: StrataRequest[] = [];
  let settingsBefore: RunSettings = settings;
  const putSettings = (body: object) =>
    as.hygienist.agent
      .put('/api/settings')
      .set('x-csrf-token', as.hygienist.csrf)
      .send({ ...body, ageBandEdges: (body as { ageBandEdges?: number[] }).ageBandEdges ?? [10, 20, 30, 40, 50, 60, 70, 80, 90] })
      .expect(200);

  beforeAll(async () => {
    ds = await openTestDataSource();
    await clearCohortData(ds);
    dc = await makeDisclosureCohort(ds);
    u = {
      outcomes: [dc.outcomes.SPA, dc.outcomes.BUS],
      groups: [dc.groups.REF, dc.groups.LOW, dc.groups.HIGH],
      sites: dc.sites,
      months: dc.months,
      threshold: THRESHOLD,
      // The run offers every window (below): the whole period from the cohort's seventh month.
      wholeStart: dc.months[6]!,
    };

    const allSites = await allSiteIds(ds);
    await provisionUser(ds, 'physician@demo.ratewarden.test', 'physician', allSites);
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', allSites);
    await provisionUser(ds, 'safety@demo.ratewarden.test', 'safety_manager', allSites);
    await provisionUser(ds, 'newcomer@demo.ratewarden.test', 'safety_manager', dc.sites.slice(0, 2));
    await provisionUser(ds, 'admin@demo.ratewarden.test', 'administrator');
    const app = createApp({ dataSource: ds, config: testApiConfig() });
    as = {
      physician: await signIn(app, 'physician@demo.ratewarden.test'),
      hygienist: await signIn(app, 'hygienist@demo.ratewarden.test'),
      safety: await signIn(app, 'safety@demo.ratewarden.test'),
      partial: await signIn(app, 'newcomer@demo.ratewarden.test'),
      admin: await signIn(app, 'admin@demo.ratewarden.test'),
    };

    // Watch rules the product's way (at the least minimum of 5), and as legacy rules stored before
    // that minimum existed, selecting on a single case, written straight into the table.
    for (const [outcomeId, measure, window] of [
      [dc.outcomes.SPA, 'rate', 'rolling12'],
      [dc.outcomes.BUS, 'irr', 'rolling12'],
      [dc.outcomes.BUS, 'rate', 'month'],
    ] as const) {
      const res = await as.safety.agent
        .post('/api/rules')
        .set('x-csrf-token', as.safety.csrf)
        .send({
          name: `Watch ${measure} ${window}`,
          outcomeId,
          measure,
          thresholdOn: 'estimate',
          threshold: 0,
          minCases: THRESHOLD,
          window,
          fdrControl: false,
        });
      expect(res.status, JSON.stringify(res.body)).toBe(201);
    }
    // Site rules too: the partial reader's own, on their two sites, and legacy ones on every site.
    for (const [outcomeId, measure, window] of [
      [dc.outcomes.SPA, 'rate', 'rolling12'],
      [dc.outcomes.BUS, 'irr', 'rolling12'],
      [dc.outcomes.BUS, 'rate', 'month'],
    ] as const) {
      const res = await as.partial.agent
        .post('/api/rules')
        .set('x-csrf-token', as.partial.csrf)
        .send({
          name: `Site watch ${measure} ${window}`,
          outcomeId,
          siteIds: dc.sites.slice(0, 2),
          measure,
          thresholdOn: 'estimate',
          threshold: 0,
          minCases: THRESHOLD,
          window,
          fdrControl: false,
        });
      expect(res.status, JSON.stringify(res.body)).toBe(201);
    }
    for (const outcomeId of u.outcomes) {
      for (const [measure, window] of [
        ['rate', 'month'],
        ['rate', 'rolling12'],
        ['irr', 'month'],
        ['irr', 'rolling12'],
      ]) {
        for (const siteIds of [null, dc.sites]) {
          await ds.query(
            `INSERT INTO watch_rules (name, outcome_id, site_ids, measure, threshold_on, threshold, min_cases, window_kind, fdr_control) VALUES ($1, $2, $3, $4, 'estimate', 0, 1, $5, false)`,
            [`Legacy ${siteIds ? 'site ' : ''}${measure} ${window}`, outcomeId, siteIds, measure, window],
          );
        }
      }
    }

    // Every analysis window offered (a settings version, put back after): the attacker reads them all together.
    await currentAnalysisSettings(ds, settings); // version 1 of a new database: the worker environment's, as a first run writes it
    const current = analysisSettingsSchema.parse((await as.hygienist.agent.get('/api/settings').expect(200)).body).current;
    settingsBefore = current?.settings ?? settings;
    await putSettings({ ...(current?.settings ?? settings), windows: [...windowKinds], wholePeriodStart: u.wholeStart });

    const first = await performRun(ds, { trigger: 'cli', settings, appUrl: 'http://127.0.0.1/' });
    expect(first.status).toBe('succeeded');
    firstRun = (first as { runId: string }).runId;
    // Three more cases in the last month before the current run: the diff has changed rows.
    const last = dc.months.at(-1)!;
    await dc.addCases([
      [dc.workers.get('0|REF')![0]!, dc.outcomes.SPA, `${last.slice(0, 8)}11`],
      [dc.workers.get('1|HIGH')![1]!, dc.outcomes.SPA, `${last.slice(0, 8)}12`],
      [dc.workers.get('2|LOW')![2]!, dc.outcomes.BUS, `${last.slice(0, 8)}13`],
    ]);
    const second = await performRun(ds, { trigger: 'cli', settings, appUrl: 'http://127.0.0.1/' });
    expect(second.status).toBe('succeeded');
    runId = (second as { runId: string }).runId;

    // Everything a reader of every site can ask for: results of each outcome, company-wide and
    // per site, every window; the company's stratum tables by age band, sex and site at every
    // window and period.
    for (const outcomeId of u.outcomes)
      for (const exposureGroupId of u.groups)
        for (const window of windowKinds)
          for (const period of u.months)
            if (isWindowEnd(window, period, { wholeStart: u.wholeStart }) && (window !== 'whole' || period >= dc.months.at(-3)!))
              for (const by of ['age', 'sex', 'site'] as const) company.push({ by, siteId: null, outcomeId, exposureGroupId, window, period });
    truth.results = await readResults(as.physician, runId, u.outcomes, u.sites);
    seen.results = await readResults(as.hygienist, runId, u.outcomes, u.sites);
    truth.strata = await readStrata(as.physician, runId, company);
    seen.strata = await readStrata(as.hygienist, runId, company);
  }, 900_000);
  afterAll(async () => {
    if (as) {
      const { ageBandEdges, countedStatuses, confidence, per, personTimeBasis } = settingsBefore;
      await putSettings({
        personTimeBasis,
        per,
        confidence,
        countedStatuses,
        ageBandEdges: ageBandEdges ?? [10, 20, 30, 40, 50, 60, 70, 80, 90],
        windows: offeredWindows(settingsBefore),
        wholePeriodStart: settingsBefore.wholePeriodStart ?? null,
      });
    }
    await smtp?.close();
    await ds?.destroy();
  });

  /** The windows a group with small months is read in: calendar years (rolling windows ending in December). */
  const yearlyEnds = () => dc.months.filter((m) => m.slice(5, 7) === '12');

  it('the cohort has small and large counts, shown and withheld, as the attacks need', () => {
    const real = [...truth.results.values()];
    expect(real.filter((r) => isSmall(r.cases!)).length).toBeGreaterThan(200);
    expect(real.filter((r) => r.cases! >= THRESHOLD).length).toBeGreaterThan(200);
    const mine = [...seen.results.values()];
    expect(new Set(seen.results.keys())).toEqual(new Set(truth.results.keys()));
    expect(mine.filter((r) => r.cases !== null && r.cases > 0).length).toBeGreaterThan(100);
    for (const why of ['small', 'complement', 'months'] as const) expect(mine.filter((r) => r.withheld === why).length, why).toBeGreaterThan(0);
    expect([...seen.strata.values()].some((t) => t.strata.some((s) => s.exposed.withheld === 'strata'))).toBe(true);
    expect([...seen.strata.values()].some((t) => t.by === 'age' && t.strata.every((s) => s.exposed.cases !== null))).toBe(true);
    // The physician sees everything, small counts included.
    expect(real.every((r) => r.cases !== null && r.withheld === null)).toBe(true);
  });

  it('the new windows: a calendar year reads as the rolling 12 ending in December; quarters and whole periods of scopes with small months are withheld', () => {
    let years = 0;
    const kinds = new Set([...seen.results.values()].map((r) => r.window));
    expect([...kinds].sort()).toEqual(['month', 'quarter', 'rolling12', 'whole', 'year']);
    for (const [k, r] of seen.results) {
      if (r.window === 'year') {
        years++;
        const rolling = seen.results.get(resultKey(r.siteId, r.outcomeId, r.exposureGroupId, 'rolling12', r.period))!;
        expect({ cases: r.cases, withheld: r.withheld, hours: r.hours }, k).toEqual({ cases: rolling.cases, withheld: rolling.withheld, hours: rolling.hours });
        expect(r.irr.estimate, k).toEqual(rolling.irr.estimate);
      }
      if (r.window !== 'quarter' && r.window !== 'whole') continue;
      // A scope whose months are withheld for being read by year has its quarters and whole periods withheld.
      const monthsWithheld = [...seen.results.values()].some(
        (m) =>
          m.window === 'month' && m.siteId === r.siteId && m.outcomeId === r.outcomeId && m.exposureGroupId === r.exposureGroupId && m.withheld === 'months',
      );
      if (monthsWithheld) expect(r.withheld, k).not.toBeNull();
    }
    expect(years).toBeGreaterThan(20);
    // The physician reads every quarter's count: the sum of its months.
    for (const r of truth.results.values()) {
      if (r.window !== 'quarter') continue;
      const months = [...truth.results.values()].filter(
        (m) =>
          m.window === 'month' &&
          m.siteId === r.siteId &&
          m.outcomeId === r.outcomeId &&
          m.exposureGroupId === r.exposureGroupId &&
          m.period <= r.period &&
          m.period > addMonths(r.period, -3),
      );
      expect(r.cases).toBe(months.reduce((a, m) => a + m.cases!, 0));
    }
  });

  it('the safety manager of every site reads exactly what the hygienist reads', async () => {
    const results = await readResults(as.safety, runId, u.outcomes, u.sites);
    expect(results).toEqual(seen.results);
    const ends = new Set(yearlyEnds());
    const requests = company.filter((q) => ends.has(q.period) && q.window === 'rolling12');
    const strata = await readStrata(as.safety, runId, requests);
    for (const [k, table] of strata) expect(table, k).toEqual(seen.strata.get(k));
  }, 300_000);

  it('no figure on a withheld row gives its count back', () => {
    const blank = { estimate: null, lower: null, upper: null };
    let withheldRows = 0;
    for (const [k, r] of seen.results) {
      const real = truth.results.get(k)!;
      if (r.cases === null) {
        withheldRows++;
        expect(r.suppressed, k).toBe(true);
        expect(r.withheld, k).not.toBeNull();
        expect(r.rate, k).toEqual(blank);
        expect(r.irr, k).toEqual({ ...blank, p: null, waldLower: null, waldUpper: null });
        expect(r.ird, k).toEqual({ ...blank, p: null });
        for (const mh of [r.mhAge, r.mhSite, r.mhSex]) expect(mh, k).toEqual({ irr: { ...blank, p: null }, ird: blank });
        expect(r.uChart, k).toEqual({ centre: null, lcl: null, ucl: null, signal: null });
        expect(r.detail, k).toEqual({});
        // The expected count is the reference group's rate times this row's person-time: shown only
        // with a shown reference count, from which (and the person-time) it follows, never from this count.
        if (r.expected !== null) {
          const ref = seen.results.get(resultKey(r.siteId, r.outcomeId, r.referenceGroupId!, r.window, r.period))!;
          expect(ref.cases, k).not.toBeNull();
          expect(r.expected, k).toBeCloseTo((ref.cases! * r.personTime) / ref.personTime, 9);
        }
      } else {
        expect(r.cases, k).toBe(real.cases);
        expect(isSmall(r.cases), k).toBe(false);
        // The rate times the person-time is this (shown) count: it never stands for a withheld one.
        if (r.personTime > 0) expect(((r.rate.estimate as number) * r.personTime) / settings.per, k).toBeCloseTo(r.cases, 6);
      }
      const ref =
        r.referenceGroupId !== null && !r.isReference ? seen.results.get(resultKey(r.siteId, r.outcomeId, r.referenceGroupId, r.window, r.period)) : undefined;
      if (r.cases !== null && ref && ref.cases === null) {
        expect(r.comparisonSuppressed, k).toBe(true);
        expect(
          [
            r.irr.estimate,
            r.irr.lower,
            r.irr.upper,
            r.irr.p,
            r.ird.estimate,
            r.ird.lower,
            r.expected,
            r.mhAge.irr.estimate,
            r.mhSite.irr.estimate,
            r.mhSex.irr.estimate,
          ],
          k,
        ).toEqual(Array(10).fill(null));
      }
    }
    for (const [k, table] of seen.strata) {
      for (const s of table.strata) {
        for (const arm of [s.exposed, s.reference]) {
          if (arm === null || arm.cases !== null) continue;
          expect(arm.rate, k).toBeNull();
          expect([s.irr, s.ird], k).toEqual([null, null]);
        }
      }
    }
    expect(withheldRows).toBeGreaterThan(500);
  });

  it('the linear attack: no withheld small count is narrowed by everything read together', () => {
    // Flags and the diff publish company and site counts of the results, asserted identical below
    // (attacks 2 and 8): the results and stratum tables hold every count the reader gets.
    const report = linearAttack(u, observe(u, seen, truth), seen.strata, truthOf(u, truth));
    expect(report.untrue).toEqual([]);
    const recovered = differencing(u, seen.results, seen.results);
    console.log(
      `disclosure attacks: ${report.cellsChecked} cells checked, ${report.withheld} withheld, ${report.targets} withheld small counts attacked, ${report.solves} LP solves, recovered: ${report.narrowed.length + recovered.size}`,
    );
    expect(report.narrowed).toEqual([]);
    expect(report.targets).toBeGreaterThan(1000);
  }, 600_000);

  it('the linear attack has teeth: with every rolling window published (small ones withheld, as before the frame) it pins small counts', () => {
    const observations = observe(u, seen, truth).map((ob) =>
      'withheld' in ob.label && ob.label.withheld === 'months' && !ob.tableLabel && ob.what.includes('|rolling12|')
        ? { ...ob, label: isSmall(ob.truth) ? { withheld: 'small' } : { shown: ob.truth } }
        : ob,
    );
    const pinned = pinnedSmallCounts(u, observations, seen.strata);
    expect(pinned.size).toBeGreaterThan(20);
    for (const [what, v] of pinned) expect(v, what).toBe(observations.find((ob) => ob.what === what)!.truth);
    // What the product publishes pins none.
    expect([...pinnedSmallCounts(u, observe(u, seen, truth), seen.strata)]).toEqual([]);
  });

  it('attack 1: the rolling-12 difference gives back no withheld month', () => {
    expect([...differencing(u, seen.results, seen.results)]).toEqual([]);
    // With every figure (the physician's) the same difference gives each withheld month back exactly.
    const withheldMonths = [...seen.results.entries()].filter(([, r]) => r.window === 'month' && r.cases === null);
    expect(withheldMonths.filter(([k]) => isSmall(truth.results.get(k)!.cases!)).length).toBeGreaterThan(50);
    const fromAll = differencing(u, seen.results, truth.results);
    expect(fromAll.size).toBe(withheldMonths.length);
    for (const [k, v] of fromAll) expect(v, k).toBe(truth.results.get(k)!.cases);
  });

  it('attack 2: watch rules below 5 cases are refused, and legacy ones never flag a small or withheld count', async () => {
    for (const who of [as.safety, as.hygienist]) {
      for (const minCases of [1, 2, 3, 4]) {
        const res = await who.agent
          .post('/api/rules')
          .set('x-csrf-token', who.csrf)
          .send({
            name: `Small ${minCases}`,
            outcomeId: dc.outcomes.SPA,
            measure: 'rate',
            thresholdOn: 'estimate',
            threshold: 0,
            minCases,
            window: 'month',
            fdrControl: false,
          });
        expect(res.status).toBe(422);
      }
    }
    const real = flagSchema.array().parse((await as.physician.agent.get('/api/flags').expect(200)).body);
    const mine = flagSchema.array().parse((await as.hygienist.agent.get('/api/flags').expect(200)).body);
    expect(real.length).toBeGreaterThan(5);
    expect(mine.map((f) => f.id).sort()).toEqual(real.map((f) => f.id).sort());
    const legacy = new Set(((await ds.query(`SELECT id FROM watch_rules WHERE min_cases < 5`)) as Array<{ id: string }>).map((r) => r.id));
    expect(real.some((f) => legacy.has(f.ruleId))).toBe(true);
    expect(real.filter((f) => f.figures.runId === runId).length).toBeGreaterThan(5);
    expect(real.filter((f) => f.siteId !== null && f.figures.runId === runId).length, 'site flags of the current run').toBeGreaterThan(5);
    for (const f of real) {
      expect(f.figures.cases, f.ruleName).toBeGreaterThanOrEqual(THRESHOLD);
      const shown = mine.find((m) => m.id === f.id)!;
      if (f.figures.runId !== runId) {
        // Figures of the earlier run are the physician's (its counts are not the current frame's).
        expect(f.figures.runId).toBe(firstRun);
        expect(shown.figures).toMatchObject({ suppressed: true, withheld: 'earlier', cases: null, value: null, estimate: null, expected: null });
        continue;
      }
      // A site flag's count is its site's own, shown in that site's results.
      const row = seen.results.get(resultKey(f.siteId, f.outcomeId, f.exposureGroupId, f.figures.window, f.figures.period))!;
      expect(row.cases, `${f.ruleName}: the flag's count is shown in the results`).toBe(f.figures.cases);
      if (f.figures.measure === 'irr' || f.figures.measure === 'ird') {
        const ref = seen.results.get(resultKey(f.siteId, f.outcomeId, row.referenceGroupId!, f.figures.window, f.figures.period))!;
        expect(ref.cases, `${f.ruleName}: its reference count is shown`).not.toBeNull();
      }
      expect(shown.figures).toMatchObject({ suppressed: false, cases: f.figures.cases, value: f.figures.value });
    }
    // At the latest period the legacy rules had small company counts to select on, and raised nothing there.
    const latest = dc.months.at(-1)!;
    const smallLatest = [...truth.results.values()].filter((r) => r.siteId === null && r.period === latest && isSmall(r.cases!));
    expect(smallLatest.length).toBeGreaterThan(0);
    for (const r of smallLatest)
      expect(
        real.some((f) => f.siteId === null && f.outcomeId === r.outcomeId && f.exposureGroupId === r.exposureGroupId && f.figures.window === r.window),
      ).toBe(false);
  });

  it('attack 3: by-site strata withhold as the site results do, and site tables by age or sex are never shown', async () => {
    let compared = 0;
    for (const [k, table] of seen.strata) {
      if (table.by !== 'site') continue;
      const [, , o, , window, period] = k.split('|');
      for (const s of table.strata) {
        for (const [arm, g] of [
          [s.exposed, table.exposureGroupId],
          [s.reference, table.referenceGroupId],
        ] as const) {
          if (arm === null || g === null) continue;
          const row = seen.results.get(resultKey(Number(s.key), Number(o), g, window!, period!));
          if (!row) {
            expect(arm.cases, k).toBe(0);
            continue;
          }
          compared++;
          expect({ cases: arm.cases, withheld: arm.withheld }, `${k} site ${s.key} group ${g}`).toEqual({ cases: row.cases, withheld: row.withheld });
        }
      }
    }
    expect(compared).toBeGreaterThan(1000);
    const siteTables: StrataRequest[] = [];
    for (const siteId of dc.sites)
      for (const outcomeId of u.outcomes)
        for (const exposureGroupId of u.groups)
          for (const period of yearlyEnds())
            for (const by of ['age', 'sex'] as const) siteTables.push({ by, siteId, outcomeId, exposureGroupId, window: 'rolling12', period });
    const tables = await readStrata(as.hygienist, runId, siteTables);
    let cells = 0;
    for (const [k, table] of tables) {
      for (const s of table.strata) {
        for (const arm of [s.exposed, s.reference]) {
          if (arm === null) continue;
          cells++;
          expect(arm.cases, k).toBeNull();
          expect(arm.rate, k).toBeNull();
        }
      }
    }
    expect(cells).toBeGreaterThan(500);
    // Company tables by age at those windows are shown where they hold no small stratum: the site
    // tables they would be differenced with are not.
    expect(
      yearlyEnds().some((p) =>
        [...seen.strata.entries()].some(
          ([k, t]) => k.startsWith('age|all|') && k.endsWith(`rolling12|${p}`) && t.strata.every((s) => s.exposed.cases !== null),
        ),
      ),
    ).toBe(true);
  }, 300_000);

  it('attack 4: adjusted measures, p and homogeneity are null wherever one of their strata is withheld', () => {
    const shown = { age: 0, sex: 0, site: 0 };
    const hidden = { age: 0, sex: 0, site: 0 };
    for (const [k, r] of seen.results) {
      if (r.isReference || r.referenceGroupId === null) continue;
      const groups = [r.exposureGroupId, r.referenceGroupId];
      const tableShown = (by: 'age' | 'sex') => {
        const table = seen.strata.get(strataKey(by, null, r.outcomeId, r.exposureGroupId, r.window, r.period));
        return (
          r.siteId === null &&
          table !== undefined &&
          table.strata.every((s) => s.exposed.cases !== null && (s.reference === null || s.reference.cases !== null))
        );
      };
      const open = {
        age: tableShown('age'),
        sex: tableShown('sex'),
        site:
          r.siteId === null && groups.every((g) => dc.sites.every((s) => seen.results.get(resultKey(s, r.outcomeId, g, r.window, r.period))?.cases !== null)),
      };
      for (const by of ['age', 'sex', 'site'] as const) {
        const mh = { age: r.mhAge, sex: r.mhSex, site: r.mhSite }[by];
        const homogeneity = r.detail[`mh${by[0]!.toUpperCase()}${by.slice(1)}Homogeneity`];
        if (open[by] && r.cases !== null && !r.comparisonSuppressed) {
          shown[by]++;
          continue;
        }
        hidden[by]++;
        expect([mh.irr.estimate, mh.irr.lower, mh.irr.upper, mh.irr.p, mh.ird.estimate, mh.ird.lower, mh.ird.upper], `${k} by ${by}`).toEqual(
          Array(7).fill(null),
        );
        expect(homogeneity, `${k} by ${by}`).toBeUndefined();
      }
    }
    for (const by of ['age', 'sex', 'site'] as const) {
      expect(hidden[by], by).toBeGreaterThan(100);
      expect(shown[by], by).toBeGreaterThan(0);
    }
  });

  it('attack 5: the audit log and the mailbox carry no counts', async () => {
    const flags = flagSchema.array().parse((await as.physician.agent.get('/api/flags').expect(200)).body);
    await as.physician.agent.get(`/api/flags/${flags[0]!.id}/cases`).expect(200);
    const port = await freePort();
    smtp = await startFakeSmtp({ port, keep: (m) => keepInMailbox(ds, m) });
    const sender = testSender(port);
    expect((await sendDueNotices(ds, createTransport(sender), sender, 500)).sent).toBeGreaterThan(0);
    // The physician's notices do hold counts: the mailbox must not pass them on.
    const kept = (await ds.query(`SELECT text_body FROM dev_mailbox`)) as Array<{ text_body: string }>;
    expect(kept.some((m) => /\d/.test(m.text_body))).toBe(true);

    const audit = auditEventSchema.array().parse((await as.admin.agent.get('/api/admin/audit').query({ limit: 1000 }).expect(200)).body);
    const flagEntries = audit.filter((e) => e.action.startsWith('flag.') || e.action.startsWith('cases.'));
    expect(flagEntries.some((e) => e.action === 'cases.read')).toBe(true);
    expect(flagEntries.some((e) => e.action === 'flag.raise')).toBe(true);
    const countish = /value|cases|count|expected|worst|previous|estimate|lower|upper|rate|irr|ird/i;
    for (const e of flagEntries)
      expect(
        Object.keys(e.detail ?? {}).filter((key) => countish.test(key)),
        `${e.action} ${e.target}`,
      ).toEqual([]);

    const box = mailboxMessageSchema.array().parse((await as.admin.agent.get('/api/mailbox').expect(200)).body);
    expect(box.length).toBe(kept.length);
    for (const m of box) {
      expect(m.text).toBeNull();
      const one = await as.admin.agent.get(`/api/mailbox/${m.id}`).expect(200);
      expect(Object.keys(one.body).sort()).toEqual(['from', 'id', 'receivedAt', 'subject', 'text', 'to']);
      expect(one.body.text).toBeNull();
    }
  });

  it("attack 6: a safety manager of some sites gets no company flags, their sites' flags with their sites' figures only, and no case totals from the run", async () => {
    const mySites = dc.sites.slice(0, 2);
    const flags = flagSchema.array().parse((await as.partial.agent.get('/api/flags').expect(200)).body);
    const real = flagSchema.array().parse((await as.physician.agent.get('/api/flags').expect(200)).body);
    expect(real.some((f) => f.siteId === null)).toBe(true);
    expect(real.some((f) => f.siteId !== null && !mySites.includes(f.siteId))).toBe(true);
    expect(flags.map((f) => f.id).sort()).toEqual(
      real
        .filter((f) => f.siteId !== null && mySites.includes(f.siteId))
        .map((f) => f.id)
        .sort(),
    );
    expect(flags.length).toBeGreaterThan(0);
    for (const f of real.filter((x) => x.siteId === null || !mySites.includes(x.siteId))) await as.partial.agent.get(`/api/flags/${f.id}`).expect(404);
    for (const f of flags) {
      expect([f.worstValue]).toEqual([null]);
      if (f.figures.runId !== runId) {
        expect(f.figures).toMatchObject({ suppressed: true, withheld: 'earlier', cases: null, value: null });
        continue;
      }
      // The figures are the site's own, as its results show them to every reader but the physician.
      const row = seen.results.get(resultKey(f.siteId, f.outcomeId, f.exposureGroupId, f.figures.window, f.figures.period))!;
      expect(row.cases).not.toBeNull();
      expect(f.figures).toMatchObject({ suppressed: false, cases: row.cases });
    }
    const current = runDetailSchema.parse((await as.partial.agent.get('/api/runs/current').expect(200)).body);
    expect(current.id).toBe(runId);
    expect(current.summary).not.toHaveProperty('cases');
    expect((await as.partial.agent.get(`/api/runs/${runId}`).expect(200)).body.summary).not.toHaveProperty('cases');
    await as.partial.agent.get(`/api/runs/${runId}/results`).expect(403);
    for (const who of [as.hygienist, as.safety])
      expect(runDetailSchema.parse((await who.agent.get('/api/runs/current').expect(200)).body).summary).not.toHaveProperty('cases');
    expect(runDetailSchema.parse((await as.physician.agent.get('/api/runs/current').expect(200)).body).summary).toHaveProperty('cases');
  });

  it('older runs: their results are the physician’s alone, and the diff withholds the earlier side', async () => {
    for (const who of [as.hygienist, as.safety]) {
      await who.agent.get(`/api/runs/${firstRun}/results`).query({ outcomeId: dc.outcomes.SPA }).expect(403);
      await who.agent
        .get(`/api/runs/${firstRun}/strata`)
        .query({ outcomeId: dc.outcomes.BUS, exposureGroupId: dc.groups.REF, window: 'rolling12', period: dc.months.at(-1), by: 'age' })
        .expect(403);
      await who.agent.get('/api/runs/diff').query({ from: runId, to: firstRun }).expect(403);
    }
    await as.physician.agent.get(`/api/runs/${firstRun}/results`).query({ outcomeId: dc.outcomes.SPA }).expect(200);
    for (const siteId of [null, ...dc.sites]) {
      const diff = runDiffSchema.parse(
        (
          await as.hygienist.agent
            .get('/api/runs/diff')
            .query({ from: firstRun, to: runId, ...(siteId !== null && { siteId }) })
            .expect(200)
        ).body,
      );
      const real = runDiffSchema.parse(
        (
          await as.physician.agent
            .get('/api/runs/diff')
            .query({ from: firstRun, to: runId, ...(siteId !== null && { siteId }) })
            .expect(200)
        ).body,
      );
      expect(diff.rows.length).toBe(real.rows.length);
      if (siteId === null) expect(diff.rows.length).toBeGreaterThan(0);
      for (const row of diff.rows) {
        if (row.before) expect(row.before).toMatchObject({ cases: null, suppressed: true, withheld: 'earlier', rate: null, irr: null });
        if (row.after) {
          const r = seen.results.get(resultKey(siteId, row.outcomeId, row.exposureGroupId, row.window, row.period))!;
          expect({ cases: row.after.cases, withheld: row.after.withheld }).toEqual({ cases: r.cases, withheld: r.withheld });
          if (row.after.cases === null) expect([row.after.rate, row.after.irr]).toEqual([null, null]);
          if (row.after.irr !== null) expect(r.irr.estimate).not.toBeNull();
        }
      }
      const realBefore = real.rows.filter((r) => r.before !== null);
      expect(realBefore.every((r) => r.before!.cases !== null)).toBe(true);
    }
  });
});

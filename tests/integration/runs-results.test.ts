import betaQuantile from '@stdlib/stats-base-dists-beta-quantile';
import chisquareQuantile from '@stdlib/stats-base-dists-chisquare-quantile';
import normalQuantile from '@stdlib/stats-base-dists-normal-quantile';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { rateTrend } from '@ratewarden/shared/stats/rate-trend';
import { performRun } from '@ratewarden/worker/runs/perform-run';
import { openTestDataSource } from '../support/test-db';
import { currentRunId, makeCohort, settings, storedResults, type Cohort, clearCohortData } from './runs-fixture';

/**
 * A run's stored numbers against an independent computation from the inserted rows: the test
 * tallies cases and hours itself and applies the textbook formulas with stdlib's quantile
 * functions (exact Poisson limits from chi-square quantiles, Garwood 1936; exact conditional IRR
 * limits from Clopper–Pearson beta quantiles; Wald IRD; Mantel–Haenszel IRR, Greenland & Robins
 * 1985; u-chart limits, Montgomery; trend score test, Breslow & Day 1987).
 */
type Row = [worker: string, month: string, site: 0 | 1, group: 'REF' | 'MID' | 'EXP', hours: number];
const people: Record<string, [number, 'F' | 'M']> = {
  r1: [1996, 'F'],
  r2: [1976, 'M'],
  r3: [1990, 'M'],
  e1: [1996, 'M'],
  e2: [1976, 'F'],
  e3: [1985, 'F'],
  m1: [1980, 'M'],
};
const rosterRows: Row[] = [
  ['r1', '2031-01-01', 0, 'REF', 160],
  ['r1', '2031-02-01', 0, 'REF', 160],
  ['r2', '2031-01-01', 1, 'REF', 150],
  ['r2', '2031-02-01', 1, 'REF', 150],
  ['r3', '2031-01-01', 0, 'REF', 170],
  ['e1', '2031-01-01', 0, 'EXP', 160],
  ['e1', '2031-02-01', 0, 'EXP', 160],
  ['e2', '2031-01-01', 1, 'EXP', 120],
  ['e2', '2031-02-01', 1, 'EXP', 120],
  ['e3', '2031-02-01', 0, 'EXP', 100],
  ['m1', '2031-01-01', 1, 'MID', 140],
  ['m1', '2031-02-01', 1, 'MID', 140],
];
const caseRows: Array<[string, string, 'confirmed' | 'suspected' | 'ruled_out']> = [
  ['e1', '2031-01-05', 'confirmed'],
  ['e1', '2031-01-20', 'confirmed'],
  ['e1', '2031-02-11', 'suspected'],
  ['e2', '2031-02-03', 'confirmed'],
  ['e3', '2031-02-27', 'confirmed'],
  ['r1', '2031-01-14', 'confirmed'],
  ['r2', '2031-02-09', 'confirmed'],
  ['r3', '2031-01-30', 'ruled_out'],
  ['m1', '2031-02-15', 'confirmed'],
];

const z = normalQuantile(0.975, 0, 1);
const py = (hours: number) => hours / 2000;
const garwood = (x: number) => ({ lower: x === 0 ? 0 : chisquareQuantile(0.025, 2 * x) / 2, upper: chisquareQuantile(0.975, 2 * x + 2) / 2 });

/** Independent tally from the rows above: confirmed cases and hours by any key. */
function tally(filter: (r: Row) => boolean, key: (r: Row) => string): Map<string, { cases: number; hours: number }> {
  const out = new Map<string, { cases: number; hours: number }>();
  for (const r of rosterRows.filter(filter)) {
    const t = out.get(key(r)) ?? { cases: 0, hours: 0 };
    t.hours += r[4];
    t.cases += caseRows.filter(([w, onset, st]) => w === r[0] && st === 'confirmed' && onset.slice(0, 7) === r[1].slice(0, 7)).length;
    out.set(key(r), t);
  }
  return out;
}
const total = (group: string, months: string[]) =>
  tally(
    (r) => r[3] === group && months.includes(r[1].slice(0, 7)),
    () => 'all',
  ).get('all') ?? { cases: 0, hours: 0 };

describe('a run stores rates, IRRs and intervals that match an independent computation', () => {
  let ds: DataSource;
  let c: Cohort;
  let runId: string;
  let results: Map<string, Record<string, unknown>>;

  beforeAll(async () => {
    ds = await openTestDataSource();
    await clearCohortData(ds);
    c = await makeCohort(ds, {
      groups: [
        ['REF', 0],
        ['MID', 1],
        ['EXP', 2],
      ],
      reference: 'REF',
      outcomes: [['INJ', 'recurrent']],
    });
    const ids: Record<string, number> = {};
    for (const [k, [by, sex]] of Object.entries(people)) ids[k] = await c.worker(k, by, sex);
    await c.roster(rosterRows.map(([w, m, s, g, h]) => [ids[w]!, m, c.sites[s]!, c.groups[g]!, h]));
    await c.cases(caseRows.map(([w, onset, st]) => [ids[w]!, c.outcomes.INJ!, onset, st]));
    const outcome = await performRun(ds, { trigger: 'cli', settings, appUrl: 'http://127.0.0.1:3000' });
    expect(outcome.status).toBe('succeeded');
    runId = (outcome as { runId: string }).runId;
    results = await storedResults(ds, runId, c.outcomes.INJ!);
  });
  afterAll(async () => {
    await ds.destroy();
  });

  it('switches the current pointer to the new run and records its inputs, settings and code version', async () => {
    expect(await currentRunId(ds)).toBe(runId);
    const [run] = (await ds.query(`SELECT state, inputs, settings, settings_version, code_version FROM runs WHERE id = $1`, [runId])) as Array<
      Record<string, any>
    >;
    expect(run!.state).toBe('succeeded');
    expect(run!.inputs.rosterIntakeIds).toContain(c.rosterIntake);
    expect(run!.inputs.caseIntakeIds).toContain(c.casesIntake);
    // The current version of the analysis settings, written whole (these settings, ten-year age bands), and its number.
    // (A version saved on the settings page also states its windows: shared/src/windows.ts.)
    const { windows: _windows, ...stated } = run!.settings as Record<string, unknown>;
    expect(stated).toEqual({ ...settings, ageBandEdges: [10, 20, 30, 40, 50, 60, 70, 80, 90] });
    const [current] = (await ds.query(`SELECT max(version) AS v FROM analysis_settings`)) as Array<{ v: number }>;
    expect(run!.settings_version).toBe(current!.v);
    expect(run!.code_version).toMatch(/^\d+\.\d+\.\d+\+computation\.\d+$/);
  });

  it.each([
    ['REF', 'month', '2031-01', ['2031-01']],
    ['EXP', 'month', '2031-01', ['2031-01']],
    ['EXP', 'month', '2031-02', ['2031-02']],
    ['MID', 'month', '2031-02', ['2031-02']],
    ['EXP', 'rolling12', '2031-02', ['2031-01', '2031-02']],
    ['REF', 'rolling12', '2031-02', ['2031-01', '2031-02']],
  ] as const)('%s %s %s: cases, hours and the rate with exact Poisson limits', (group, window, period, months) => {
    const t = total(group, [...months]);
    const r = results.get(`${c.groups[group]}:${window}:${period}`)!;
    expect(r.cases).toBe(t.cases);
    expect(Number(r.hours)).toBe(t.hours);
    expect(r.person_time).toBeCloseTo(py(t.hours), 12);
    const g = garwood(t.cases);
    expect(r.rate).toBeCloseTo((t.cases / py(t.hours)) * 1000, 8);
    expect(r.rate_lower as number).toBeCloseTo((g.lower / py(t.hours)) * 1000, 6);
    expect(r.rate_upper as number).toBeCloseTo((g.upper / py(t.hours)) * 1000, 6);
  });

  it('counts only confirmed cases and keeps two cases of one worker in one month (recurrent)', () => {
    expect(results.get(`${c.groups.EXP}:month:2031-01`)!.cases).toBe(2);
    // Poisson exact limits for 4 events: 1.0899 and 10.2416 (standard tables, from memory).
    const r = results.get(`${c.groups.EXP}:rolling12:2031-02`)!;
    expect(((r.rate_lower as number) * py(660)) / 1000).toBeCloseTo(1.0899, 3);
    expect(((r.rate_upper as number) * py(660)) / 1000).toBeCloseTo(10.2416, 3);
  });

  it('IRR against the reference group with exact conditional and Wald limits, IRD with its Wald interval', () => {
    const a = total('EXP', ['2031-01', '2031-02']);
    const b = total('REF', ['2031-01', '2031-02']);
    const [t1, t0] = [py(a.hours), py(b.hours)];
    const r = results.get(`${c.groups.EXP}:rolling12:2031-02`)!;
    const irr = a.cases / t1 / (b.cases / t0);
    expect(r.irr).toBeCloseTo(irr, 10);
    const m = a.cases + b.cases;
    const piL = betaQuantile(0.025, a.cases, m - a.cases + 1);
    const piU = betaQuantile(0.975, a.cases + 1, m - a.cases);
    expect(r.irr_lower as number).toBeCloseTo((piL / (1 - piL)) * (t0 / t1), 6);
    expect(r.irr_upper as number).toBeCloseTo((piU / (1 - piU)) * (t0 / t1), 6);
    const se = Math.sqrt(1 / a.cases + 1 / b.cases);
    expect(r.irr_wald_lower as number).toBeCloseTo(irr * Math.exp(-z * se), 8);
    expect(r.irr_wald_upper as number).toBeCloseTo(irr * Math.exp(z * se), 8);
    const ird = (a.cases / t1 - b.cases / t0) * 1000;
    const seD = Math.sqrt(a.cases / t1 ** 2 + b.cases / t0 ** 2) * 1000;
    expect(r.ird).toBeCloseTo(ird, 6);
    expect(r.ird_lower as number).toBeCloseTo(ird - z * seD, 6);
    expect(r.ird_upper as number).toBeCloseTo(ird + z * seD, 6);
    expect(r.expected).toBeCloseTo((b.cases * t1) / t0, 10);
    expect(r.is_reference).toBe(false);
    expect(results.get(`${c.groups.REF}:rolling12:2031-02`)!.irr).toBeNull();
  });

  it.each([
    ['site', (r: Row) => String(r[2])],
    ['age', (r: Row) => String(Math.floor((2031 - people[r[0]]![0]) / 10) * 10)],
  ] as const)('Mantel–Haenszel IRR and IRD by %s', (kind, key) => {
    const months = (r: Row) => r[1] < '2031-03';
    const ex = tally((r) => r[3] === 'EXP' && months(r), key);
    const re = tally((r) => r[3] === 'REF' && months(r), key);
    let num = 0,
      den = 0,
      varNum = 0,
      dNum = 0,
      w = 0,
      dVar = 0;
    for (const k of new Set([...ex.keys(), ...re.keys()])) {
      const e = ex.get(k) ?? { cases: 0, hours: 0 };
      const f = re.get(k) ?? { cases: 0, hours: 0 };
      const [t1, t0] = [py(e.hours), py(f.hours)];
      if (t1 === 0 || t0 === 0) continue;
      const t = t1 + t0;
      num += (e.cases * t0) / t;
      den += (f.cases * t1) / t;
      varNum += ((e.cases + f.cases) * t1 * t0) / t ** 2;
      dNum += (e.cases * t0 - f.cases * t1) / t;
      w += (t1 * t0) / t;
      dVar += ((t1 * t0) / t) ** 2 * (e.cases / t1 ** 2 + f.cases / t0 ** 2);
    }
    const r = results.get(`${c.groups.EXP}:rolling12:2031-02`)!;
    const irr = num / den;
    const se = Math.sqrt(varNum / (num * den));
    expect(r[`mh_${kind}_irr`]).toBeCloseTo(irr, 10);
    expect(r[`mh_${kind}_irr_lower`] as number).toBeCloseTo(irr * Math.exp(-z * se), 8);
    expect(r[`mh_${kind}_irr_upper`] as number).toBeCloseTo(irr * Math.exp(z * se), 8);
    expect(r[`mh_${kind}_ird`] as number).toBeCloseTo((dNum / w) * 1000, 6);
    expect(r[`mh_${kind}_ird_lower`] as number).toBeCloseTo((dNum / w - (z * Math.sqrt(dVar)) / w) * 1000, 6);
  });

  it('u-chart centre line and 3-sigma limits of single months', () => {
    const jan = total('EXP', ['2031-01']);
    const feb = total('EXP', ['2031-02']);
    const centre = (jan.cases + feb.cases) / py(jan.hours + feb.hours);
    const r = results.get(`${c.groups.EXP}:month:2031-01`)!;
    expect(r.u_centre).toBeCloseTo(centre, 10);
    expect(r.u_ucl).toBeCloseTo(centre + 3 * Math.sqrt(centre / py(jan.hours)), 10);
    expect(r.u_lcl).toBeCloseTo(Math.max(0, centre - 3 * Math.sqrt(centre / py(jan.hours))), 10);
    expect(r.u_signal).toBe('within');
  });

  it('score test for trend across the ordered exposure levels', async () => {
    // Every exposure group of the company with a level counts, other test cohorts' groups included,
    // so the levels are tallied from the stored group rows (checked above) by exposure level.
    const rows = (await ds.query(
      `SELECT g.exposure_level AS score, sum(r.cases)::int AS cases, sum(r.person_time) AS pt
       FROM run_results r JOIN exposure_groups g ON g.id = r.exposure_group_id
       WHERE r.run_id = $1 AND r.site_id IS NULL AND r.outcome_id = $2 AND r.window_kind = 'rolling12' AND r.period = '2031-02-01' AND g.exposure_level IS NOT NULL
       GROUP BY g.exposure_level`,
      [runId, c.outcomes.INJ],
    )) as Array<{ score: number; cases: number; pt: number }>;
    expect(rows.length).toBeGreaterThanOrEqual(3);
    const o = rows.reduce((s, l) => s + l.cases, 0);
    const tt = rows.reduce((s, l) => s + l.pt, 0);
    let u = 0,
      sxx = 0,
      sx = 0;
    for (const l of rows) {
      const e = (o * l.pt) / tt; // E_j = O T_j / T (Breslow & Day 1987)
      u += l.score * (l.cases - e);
      sxx += l.score ** 2 * e;
      sx += l.score * e;
    }
    const chi2 = u ** 2 / (sxx - sx ** 2 / o);
    // The run does not store the test: the trends page computes it from the stored rows with the
    // statistics core (web/src/features/results/trend-levels.ts), which must agree with the hand formula.
    const trend = rateTrend(
      rows.map((l) => ({ score: Number(l.score), cases: l.cases, personTime: Number(l.pt) })),
      { confidence: 0.95, per: 1000 },
    );
    expect(trend.chi2).toBeCloseTo(chi2, 8);
    expect(trend.u).toBeCloseTo(u, 8);
  });

  it('a late case makes a new run whose results differ, and the old run keeps its numbers', async () => {
    const [e2] = (await ds.query(`SELECT id FROM workers WHERE worker_key = $1`, [`${c.tag}-e2`])) as Array<{ id: string }>;
    await c.cases([[Number(e2!.id), c.outcomes.INJ!, '2031-01-22']]);
    const second = await performRun(ds, { trigger: 'cli', settings, appUrl: 'http://127.0.0.1:3000' });
    expect(second.status).toBe('succeeded');
    const secondId = (second as { runId: string }).runId;
    expect(await currentRunId(ds)).toBe(secondId);
    const after = await storedResults(ds, secondId, c.outcomes.INJ!);
    expect(after.get(`${c.groups.EXP}:month:2031-01`)!.cases).toBe(3);
    const before = await storedResults(ds, runId, c.outcomes.INJ!);
    expect(before.get(`${c.groups.EXP}:month:2031-01`)!.cases).toBe(2);
  });
});

import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { performRun } from '@ratewarden/worker/runs/perform-run';
import { openTestDataSource } from '../support/test-db';
import { clearCohortData, makeCohort, settings, storedResults, type Cohort } from './runs-fixture';

/**
 * Hand-built example of the counting rules (numbers worked out by hand beside each check):
 * every worker has 100 h a month in January–April 2031.
 *   e1 (EXP): first hearing case 10 Feb, a second one 2 Apr (not counted: first event only)
 *   e2 (EXP): no case
 *   e3 (EXP): first case Dec 2030, before the roster: no person-time at risk at all
 *   w1: EXP in January, REF from February; a lagged outcome's case in February
 *   r1 (REF): no case
 */
describe('counting rules and exposure lag', () => {
  let ds: DataSource;
  let c: Cohort;
  let hear: Map<string, Record<string, unknown>>;
  let lag: Map<string, Record<string, unknown>>;
  let summary: Record<string, any>;

  beforeAll(async () => {
    ds = await openTestDataSource();
    await clearCohortData(ds);
    c = await makeCohort(ds, {
      groups: [
        ['REF', 0],
        ['EXP', 2],
      ],
      reference: 'REF',
      outcomes: [
        ['HEAR', 'first_event'],
        ['LAG', 'recurrent', 1],
      ],
    });
    const [e1, e2, e3, w1, r1] = [
      await c.worker('e1', 1980, 'M'),
      await c.worker('e2', 1980, 'F'),
      await c.worker('e3', 1970, 'M'),
      await c.worker('w1', 1990, 'F'),
      await c.worker('r1', 1985, 'F'),
    ];
    const months = ['2031-01-01', '2031-02-01', '2031-03-01', '2031-04-01'];
    const rows: Array<[number, string, number, number, number]> = [];
    for (const m of months) {
      for (const w of [e1, e2, e3]) rows.push([w, m, c.sites[0]!, c.groups.EXP!, 100]);
      rows.push([r1, m, c.sites[1]!, c.groups.REF!, 100]);
      rows.push([w1, m, c.sites[1]!, m === '2031-01-01' ? c.groups.EXP! : c.groups.REF!, 100]);
    }
    await c.roster(rows);
    await c.cases([
      [e1, c.outcomes.HEAR!, '2031-02-10'],
      [e1, c.outcomes.HEAR!, '2031-04-02'],
      [e3, c.outcomes.HEAR!, '2030-12-15'],
      [w1, c.outcomes.LAG!, '2031-02-20'],
    ]);
    const outcome = await performRun(ds, { trigger: 'cli', settings, appUrl: 'http://127.0.0.1:3000' });
    expect(outcome.status).toBe('succeeded');
    const runId = (outcome as { runId: string }).runId;
    hear = await storedResults(ds, runId, c.outcomes.HEAR!);
    lag = await storedResults(ds, runId, c.outcomes.LAG!);
    summary = ((await ds.query(`SELECT summary FROM runs WHERE id = $1`, [runId])) as Array<{ summary: Record<string, any> }>)[0]!.summary;
  });
  afterAll(async () => {
    await ds.destroy();
  });

  it.each([
    // [month, hours, cases] worked out by hand
    ['2031-01', 300, 0], // e1, e2, w1; e3 is out (case before the roster)
    ['2031-02', 200, 1], // e1 (month of the first case kept whole) and e2
    ['2031-03', 100, 0], // e2 only: e1 left the at-risk time after February
    ['2031-04', 100, 0], // e2; e1's second case is not counted
  ] as const)('first event only: EXP %s has %i hours and %i cases', (month, hours, cases) => {
    const r = hear.get(`${c.groups.EXP}:month:${month}`)!;
    expect(Number(r.hours)).toBe(hours);
    expect(r.cases).toBe(cases);
  });

  it('first event only over the rolling window: 700 hours, 1 case (by hand), and the prevalent case is reported unattributed', () => {
    const r = hear.get(`${c.groups.EXP}:rolling12:2031-04`)!;
    expect(Number(r.hours)).toBe(700);
    expect(r.cases).toBe(1);
    expect(r.rate).toBeCloseTo((1 / (700 / 2000)) * 1000, 10);
    const totals = (summary.cases as Array<{ outcomeId: number; counted: number; attributed: number }>).find((t) => t.outcomeId === c.outcomes.HEAR);
    expect(totals).toEqual({ outcomeId: c.outcomes.HEAR, counted: 2, attributed: 1 });
  });

  it('a recurrent outcome on the same roster keeps all the person-time', () => {
    const r = lag.get(`${c.groups.EXP}:rolling12:2031-04`)!;
    // Lag 1: January–March rows credited to February–April; EXP had 4 workers in January, 3 after.
    expect(Number(r.hours)).toBe(400 + 300 + 300);
  });

  it('exposure lag of one month: the February case is counted in the group the worker had in January', () => {
    const feb = lag.get(`${c.groups.EXP}:month:2031-02`)!;
    expect(feb.cases).toBe(1);
    expect(Number(feb.hours)).toBe(400);
    expect(lag.get(`${c.groups.REF}:month:2031-02`)!.cases).toBe(0);
    expect(lag.has(`${c.groups.EXP}:month:2031-01`)).toBe(false); // nothing is credited to the first month
  });
});

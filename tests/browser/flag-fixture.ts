import type { DataSource } from 'typeorm';
import { performRun } from '@ratewarden/worker/runs/perform-run';
import { clearCohortData, makeCohort, settings, type Cohort } from '../integration/runs-fixture';

/**
 * A private cohort with one flag for the browser tests, made with SQL and one real run: groups
 * REF (reference), MID and EXP with 10 workers each over two months of 2032 (160 h a month);
 * EXP has 24 confirmed cases, REF and MID five each, so EXP's IRR is 4.8 with an exact lower 95%
 * bound well above 1 and the watch rule "IRR lower bound above 1" raises exactly one flag (rules
 * look at counts every reader may see only, so the reference count is not small). Other files'
 * cohorts are emptied first: a site of theirs still expected in these months would leave the
 * company's months partial, and rules look at complete periods only.
 */
export interface FlagFixture {
  cohort: Cohort;
  ruleId: string;
  flagId: string;
  caseRefs: string[];
}

export async function makeFlagFixture(ds: DataSource): Promise<FlagFixture> {
  await clearCohortData(ds);
  const c = await makeCohort(ds, {
    groups: [
      ['REF', 0],
      ['MID', 1],
      ['EXP', 2],
    ],
    reference: 'REF',
    outcomes: [['DERM', 'recurrent']],
  });
  const ids: Record<string, number[]> = { REF: [], MID: [], EXP: [] };
  const rows: Array<[number, string, number, number, number]> = [];
  for (const g of ['REF', 'MID', 'EXP'] as const) {
    for (let i = 0; i < 10; i++) {
      const w = await c.worker(`${g}${i}`, 1970 + i * 3, i % 2 ? 'F' : 'M');
      ids[g]!.push(w);
      for (const m of ['2032-11-01', '2032-12-01']) rows.push([w, m, c.sites[i % 2]!, c.groups[g]!, 160]);
    }
  }
  await c.roster(rows);
  await c.cases([
    ...ids
      .EXP!.slice(0, 6)
      .flatMap((w) => ['2032-11-10', '2032-11-12', '2032-12-10', '2032-12-12'].map((d) => [w, c.outcomes.DERM!, d] as [number, number, string])),
    ...ids.REF!.slice(0, 5).map((w) => [w, c.outcomes.DERM!, '2032-12-03'] as [number, number, string]),
    ...ids.MID!.slice(0, 5).map((w) => [w, c.outcomes.DERM!, '2032-12-03'] as [number, number, string]),
  ]);
  const [rule] = (await ds.query(
    `INSERT INTO watch_rules (name, outcome_id, measure, threshold_on, threshold, min_cases, window_kind)
     VALUES ($1, $2, 'irr', 'lower_bound', 1, 5, 'rolling12') RETURNING id`,
    [`IRR lower bound above 1 (${c.tag})`, c.outcomes.DERM],
  )) as Array<{ id: string }>;
  const run = await performRun(ds, { trigger: 'cli', settings, appUrl: 'http://127.0.0.1:3000', waitForLockMs: 60_000 });
  if (run.status !== 'succeeded') throw new Error(`the fixture's run did not succeed: ${JSON.stringify(run)}`);
  const flags = (await ds.query(`SELECT id FROM flags WHERE rule_id = $1`, [rule!.id])) as Array<{ id: string }>;
  if (flags.length !== 1) throw new Error(`expected one flag from the fixture's rule, found ${flags.length}`);
  const refs = (await ds.query(`SELECT case_ref FROM case_events WHERE intake_id = $1 AND worker_id = ANY($2::bigint[]) ORDER BY case_ref`, [
    c.casesIntake,
    ids.EXP,
  ])) as Array<{ case_ref: string }>;
  return { cohort: c, ruleId: rule!.id, flagId: flags[0]!.id, caseRefs: refs.map((r) => r.case_ref) };
}

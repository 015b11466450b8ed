import type { DataSource } from 'typeorm';
import { makeCohort, type Cohort } from './runs-fixture';

/**
 * An excess at one site that the company's figures dilute, for the site-level watch rule tests.
 * Two sites, November and December of `year`, 160 h a month per worker, recurrent outcome SKIN,
 * every month's count per group and scope 0 or at least 5 (so the disclosure frame shows every
 * count):
 *
 * - site one: EXP 20 cases in 1.6 person-years, REF 5 in 1.6: IRR 4, exact conditional lower
 *   95% bound 1.4568 (20 of 25 at p = ½: Clopper–Pearson lower limit 0.59296, SciPy
 *   `beta.ppf(0.025, 20, 6)`, as odds 0.59296 / 0.40704);
 * - site two: EXP 5 cases in 4.8 person-years, REF 5 in 1.6: IRR ⅓;
 * - the company: EXP 25 in 6.4, REF 10 in 3.2: IRR 1.25, its lower bound well under 1.
 *
 * Also a third site without data, which a person of sites one and two does not have.
 */
export interface SiteExcessCohort {
  cohort: Cohort;
  /** Site one's EXP and REF workers (ten each). */
  exp: number[];
  ref: number[];
  thirdSite: number;
}

export async function siteExcessCohort(ds: DataSource, year: number): Promise<SiteExcessCohort> {
  const c = await makeCohort(ds, {
    groups: [
      ['REF', 0],
      ['EXP', 1],
    ],
    reference: 'REF',
    outcomes: [['SKIN', 'recurrent']],
  });
  const [one, two] = c.sites as [number, number];
  const rows: Array<[number, string, number, number, number]> = [];
  const add = async (key: string, site: number, group: 'REF' | 'EXP') => {
    const w = await c.worker(key, 1980, 'F');
    for (const m of [`${year}-11-01`, `${year}-12-01`]) rows.push([w, m, site, c.groups[group]!, 160]);
    return w;
  };
  const exp: number[] = [];
  const ref: number[] = [];
  const exp2: number[] = [];
  const ref2: number[] = [];
  for (let i = 0; i < 10; i++) exp.push(await add(`E1-${i}`, one, 'EXP'));
  for (let i = 0; i < 10; i++) ref.push(await add(`R1-${i}`, one, 'REF'));
  for (let i = 0; i < 30; i++) exp2.push(await add(`E2-${i}`, two, 'EXP'));
  for (let i = 0; i < 10; i++) ref2.push(await add(`R2-${i}`, two, 'REF'));
  await c.roster(rows);
  const skin = c.outcomes.SKIN!;
  await c.cases([
    ...exp.flatMap(
      (w) =>
        [
          [w, skin, `${year}-11-09`],
          [w, skin, `${year}-12-09`],
        ] as Array<[number, number, string]>,
    ),
    ...ref.slice(0, 5).map((w) => [w, skin, `${year}-12-04`] as [number, number, string]),
    ...exp2.slice(0, 5).map((w) => [w, skin, `${year}-12-05`] as [number, number, string]),
    ...ref2.slice(0, 5).map((w) => [w, skin, `${year}-12-06`] as [number, number, string]),
  ]);
  const [third] = (await ds.query(`INSERT INTO sites (code, name) VALUES ($1, 'Run test site three') RETURNING id`, [`RC${c.tag}`])) as Array<{ id: number }>;
  return { cohort: c, exp, ref, thirdSite: third!.id };
}

import type { DataSource } from 'typeorm';
import { makeCohort, type Cohort } from './runs-fixture';
import { prng } from '@ratewarden/db/seed/demo-generator';

/**
 * An invented cohort for the disclosure attacks, the same on every run (seeded generator): four
 * sites (the fourth opens in the cohort's fourth month), a reference group and two exposed groups,
 * twelve workers per site and group over 30 months (2031-01 to 2033-06) with birth years over five
 * decades, both sexes and a few unknown ones, and two recurrent outcomes:
 *
 * - SPA, sparse: every group's site months are mostly 0 to 3 cases, so nearly every table has
 *   small counts, and the yearly sums of a site are sometimes small, sometimes not.
 * - BUS, busy: the reference group has 0 or 5 to 9 cases in every site month (nothing small
 *   anywhere); group LOW has 2 or 3 cases a month at three sites and a rare single case at the
 *   fourth (the company's months are never small, the sites' are); group HIGH is mixed.
 */
export interface DisclosureCohort {
  cohort: Cohort;
  sites: number[];
  groups: { REF: number; LOW: number; HIGH: number };
  outcomes: { SPA: number; BUS: number };
  months: string[];
  /** Workers by site index and group name. */
  workers: Map<string, number[]>;
  /** Adds confirmed cases (worker, outcome, onset date). */
  addCases(rows: Array<[worker: number, outcome: number, onset: string]>): Promise<void>;
}

function poisson(rnd: () => number, mean: number): number {
  const l = Math.exp(-mean);
  let k = 0;
  let p = 1;
  do {
    k++;
    p *= rnd();
  } while (p > l);
  return k - 1;
}

export const MONTH_COUNT = 30;
const monthOf = (i: number) => `${2031 + Math.floor(i / 12)}-${String((i % 12) + 1).padStart(2, '0')}-01`;

type GroupName = 'REF' | 'LOW' | 'HIGH';

/** Cases of one outcome, group and site in month `m`. */
function casesIn(rnd: () => number, outcome: 'SPA' | 'BUS', group: GroupName, site: number, m: number): number {
  if (outcome === 'SPA') {
    const mean = { REF: 0.9, LOW: 0.35, HIGH: site === 0 ? 1.6 : 0.6 }[group];
    return poisson(rnd, mean);
  }
  if (group === 'REF') return rnd() < 0.15 ? 0 : 5 + Math.floor(rnd() * 5);
  if (group === 'LOW') return site === 3 ? (rnd() < 0.12 ? 1 : 0) : 2 + Math.floor(rnd() * 2);
  return m % 7 === 3 ? 6 + Math.floor(rnd() * 4) : poisson(rnd, 1.4);
}

export async function makeDisclosureCohort(ds: DataSource, seed = 20261202): Promise<DisclosureCohort> {
  const rnd = prng(seed);
  const cohort = await makeCohort(ds, {
    groups: [
      ['REF', 0],
      ['LOW', 1],
      ['HIGH', 2],
    ],
    reference: 'REF',
    outcomes: [
      ['SPA', 'recurrent'],
      ['BUS', 'recurrent'],
    ],
  });
  const more = (await ds.query(`INSERT INTO sites (code, name) VALUES ($1, 'Run test site three'), ($2, 'Run test site four') RETURNING id`, [
    `RC${cohort.tag}`,
    `RD${cohort.tag}`,
  ])) as Array<{ id: number }>;
  const sites = [...cohort.sites, ...more.map((s) => s.id)];
  const groups = { REF: cohort.groups.REF!, LOW: cohort.groups.LOW!, HIGH: cohort.groups.HIGH! };
  const outcomes = { SPA: cohort.outcomes.SPA!, BUS: cohort.outcomes.BUS! };
  const months = Array.from({ length: MONTH_COUNT }, (_, i) => monthOf(i));

  const workers = new Map<string, number[]>();
  const roster: Array<[number, string, number, number, number]> = [];
  for (const [si, site] of sites.entries()) {
    for (const g of ['REF', 'LOW', 'HIGH'] as const) {
      const list: number[] = [];
      for (let i = 0; i < 12; i++) {
        const birth = i === 11 ? null : 1955 + Math.floor(rnd() * 50);
        const sex = i === 10 ? null : rnd() < 0.45 ? 'F' : 'M';
        const w = await cohort.worker(`s${si}${g}${i}`, birth, sex);
        list.push(w);
        months.forEach((m, mi) => {
          if (si === 3 && mi < 3) return;
          roster.push([w, m, site, groups[g], 100 + Math.floor(rnd() * 70)]);
        });
      }
      workers.set(`${si}|${g}`, list);
    }
  }
  await cohort.roster(roster);
  // The case list reports every rostered month of all four sites (makeCohort's roster() names its own two): complete periods.
  await ds.query(`UPDATE intakes SET reports_site_ids = $2, reports_through = (SELECT max(month) FROM roster_slices WHERE site_id = ANY($2)) WHERE id = $1`, [
    cohort.casesIntake,
    sites,
  ]);

  let caseNo = 0;
  const addCases = async (rows: Array<[number, number, string]>) => {
    const refs = rows.map(() => `${cohort.tag}-D${++caseNo}`);
    await ds.query(
      `INSERT INTO case_events (intake_id, case_ref, worker_id, outcome_id, onset_date, status)
       SELECT $1, r, w, o, d, 'confirmed' FROM unnest($2::text[], $3::bigint[], $4::int[], $5::date[]) AS x(r, w, o, d)`,
      [cohort.casesIntake, refs, rows.map((r) => r[0]), rows.map((r) => r[1]), rows.map((r) => r[2])],
    );
  };
  const cases: Array<[number, number, string]> = [];
  for (const o of ['SPA', 'BUS'] as const) {
    for (const [si] of sites.entries()) {
      for (const g of ['REF', 'LOW', 'HIGH'] as const) {
        const list = workers.get(`${si}|${g}`)!;
        months.forEach((m, mi) => {
          if (si === 3 && mi < 3) return;
          const n = casesIn(rnd, o, g, si, mi);
          for (let k = 0; k < n; k++)
            cases.push([list[Math.floor(rnd() * list.length)]!, outcomes[o], `${m.slice(0, 8)}${String(1 + Math.floor(rnd() * 28)).padStart(2, '0')}`]);
        });
      }
    }
  }
  await addCases(cases);
  return { cohort, sites, groups, outcomes, months, workers, addCases };
}

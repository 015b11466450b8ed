import { randomBytes } from 'node:crypto';
import type { Express } from 'express';
import type { DataSource } from 'typeorm';
import { provisionUser, signIn, type SignedInAgent } from '../support/sign-in';
import { allSiteIds } from '../support/test-db';

/**
 * The month of issue 12, played through the API: two sites, a reference group REF and an exposed
 * group EXP, one recurrent outcome. History (Nov 2025 to Oct 2026): at North 20 EXP and 20 REF
 * workers, at South 10 and 10, each 150 h a month; EXP has 5 cases in Mar 2026 and 5 in Jun 2026,
 * REF 8 in Apr 2026 (no month with 1 to 4 cases, so nothing is withheld and watch rules see every
 * count). The new month, Nov 2026, brings 100 more REF workers at North; its case list brings 5
 * REF cases in Nov 2026.
 *
 * A rule "IRR above 1.5 (estimate), rolling 12 months" compares EXP with REF. Equal person-time
 * in every window, so by hand:
 * - twelve months ending Oct 2026: 10 / 8 = 1.25, no flag;
 * - ending Nov 2026 with the roster only: EXP 12 × 4,500 h = 54,000 h, REF 11 × 4,500 + 130 × 150
 *   = 69,000 h, IRR (10 / 54,000) / (8 / 69,000) = 1.597, over 1.5: a flag if a rule looked at it;
 * - ending Nov 2026 with the case list too: (10 / 54,000) / (13 / 69,000) = 0.983, no flag.
 */
export interface MonthCohort {
  tag: string;
  sites: { north: number; south: number };
  groups: { ref: number; exp: number };
  outcome: number;
  codes: { north: string; south: string; ref: string; exp: string; outcome: string };
  hygienist: SignedInAgent;
  uploadRoster(rows: string[], fileName?: string): Promise<{ id: string; state: string }>;
  uploadCases(rows: string[], reportsThrough?: string): Promise<{ id: string; state: string }>;
  /** The roster of the new month, Nov 2026 (roster only). */
  newMonthRoster(): Promise<{ id: string; state: string }>;
  /** The case list of the new month: history's cases and 5 REF cases in Nov 2026. */
  newMonthCases(): Promise<{ id: string; state: string }>;
}

export const ROSTER_HEADER = 'worker_key,site,exposure_group,month,hours,birth_year,sex';
export const CASES_HEADER = 'case_ref,worker_key,outcome,onset_date,status';
export const HISTORY_MONTHS = [
  '2025-11',
  '2025-12',
  '2026-01',
  '2026-02',
  '2026-03',
  '2026-04',
  '2026-05',
  '2026-06',
  '2026-07',
  '2026-08',
  '2026-09',
  '2026-10',
];
export const NEW_MONTH = '2026-11';

export async function monthCohort(ds: DataSource, app: Express, opts: { historyMonths?: string[]; withCases?: boolean } = {}): Promise<MonthCohort> {
  const tag = randomBytes(3).toString('hex').toUpperCase();
  const codes = { north: `N${tag}`, south: `S${tag}`, ref: `REF${tag}`, exp: `EXP${tag}`, outcome: `NOISE${tag}` };
  const [north, south] = (
    (await ds.query(`INSERT INTO sites (code, name) VALUES ($1, $2), ($3, $4) RETURNING id`, [
      codes.north,
      `North ${tag}`,
      codes.south,
      `South ${tag}`,
    ])) as Array<{ id: number }>
  ).map((s) => s.id);
  const [ref, exp] = (
    (await ds.query(
      `INSERT INTO exposure_groups (code, name, hazard, exposure_level) VALUES ($1, 'Reference', 'none', 0), ($2, 'Exposed', 'noise', 1) RETURNING id`,
      [codes.ref, codes.exp],
    )) as Array<{ id: number }>
  ).map((g) => g.id);
  const [row] = (await ds.query(
    `INSERT INTO outcomes (code, name, case_definition, counting_rule, reference_group_id) VALUES ($1, 'Hearing loss', 'test', 'recurrent', $2) RETURNING id`,
    [codes.outcome, ref],
  )) as Array<{ id: number }>;
  const outcome = row!.id;
  // The hygienist reads every site, so company figures and company-wide rules are theirs.
  await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', await allSiteIds(ds));
  const hygienist = await signIn(app, 'hygienist@demo.ratewarden.test');

  const post = async (query: string, body: string, fileName: string) => {
    const res = await hygienist.agent
      .post(`/api/intakes?${query}`)
      .set('x-csrf-token', hygienist.csrf)
      .attach('file', Buffer.from(body), { filename: fileName, contentType: 'text/csv' });
    if (res.status !== 201) throw new Error(`upload ${fileName} answered ${res.status}: ${JSON.stringify(res.body).slice(0, 400)}`);
    return res.body.intake as { id: string; state: string };
  };
  const uploadRoster = (rows: string[], fileName = `roster-${tag}.csv`) => post('kind=roster&mode=apply', `${ROSTER_HEADER}\n${rows.join('\n')}\n`, fileName);
  const uploadCases = (rows: string[], reportsThrough?: string) =>
    post(
      `kind=cases&mode=apply${reportsThrough ? `&reportsThrough=${reportsThrough}` : ''}`,
      `${CASES_HEADER}\n${rows.join('\n')}\n`,
      `cases-${tag}-${rows.length}.csv`,
    );

  const workers = (prefix: string, n: number, site: string, group: string, months: string[]) =>
    Array.from({ length: n }, (_, i) => months.map((m) => `${tag}-${prefix}${i},${site},${group},${m},150,${1970 + (i % 30)},${i % 2 ? 'F' : 'M'}`)).flat();
  const historyMonths = opts.historyMonths ?? HISTORY_MONTHS;
  const monthRows = (months: string[]) => [
    ...workers('NE', 20, codes.north, codes.exp, months),
    ...workers('NR', 20, codes.north, codes.ref, months),
    ...workers('SE', 10, codes.south, codes.exp, months),
    ...workers('SR', 10, codes.south, codes.ref, months),
  ];
  const historyCases = [
    ...Array.from({ length: 5 }, (_, i) => `${tag}-C${i},${tag}-NE${i},${codes.outcome},2026-03-1${i},confirmed`),
    ...Array.from({ length: 5 }, (_, i) => `${tag}-C${5 + i},${tag}-NE${5 + i},${codes.outcome},2026-06-1${i},confirmed`),
    ...Array.from({ length: 8 }, (_, i) => `${tag}-C${10 + i},${tag}-NR${i},${codes.outcome},2026-04-1${i},confirmed`),
  ];
  await uploadRoster(monthRows(historyMonths), `history-${tag}.csv`);
  if (opts.withCases !== false) await uploadCases(historyCases);

  return {
    tag,
    sites: { north: north!, south: south! },
    groups: { ref: ref!, exp: exp! },
    outcome,
    codes,
    hygienist,
    uploadRoster,
    uploadCases,
    newMonthRoster: () =>
      uploadRoster([...monthRows([NEW_MONTH]), ...workers('NN', 100, codes.north, codes.ref, [NEW_MONTH])], `roster-${tag}-${NEW_MONTH}.csv`),
    newMonthCases: () =>
      uploadCases([...historyCases, ...Array.from({ length: 5 }, (_, i) => `${tag}-D${i},${tag}-NN${i},${codes.outcome},${NEW_MONTH}-0${i + 1},confirmed`)]),
  };
}

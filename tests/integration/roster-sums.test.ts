import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { CELLS_FROM_ENTRIES_SQL, CELLS_SQL } from '@ratewarden/worker/runs/cells-query';
import { CELLS_AND_SIR_SQL } from '@ratewarden/worker/runs/sir-query';
import { openTestDataSource } from '../support/test-db';
import { clearCohortData, makeCohort, type Cohort } from './runs-fixture';

/**
 * `roster_sums` (migration 1764635900000): the triggers keep each intake's sums equal to its
 * entries through every way rows arrive or leave, so the run's cells from the sums are the cells
 * the entries give (the oracle: the same statement summing the entries themselves).
 */
describe('roster sums kept by triggers', () => {
  let ds: DataSource;
  let c: Cohort;
  const params = [['confirmed'], [18, 30, 40, 50, 60]];
  const cells = async (sql: string) =>
    ((await ds.query(sql, params)) as Array<Record<string, unknown>>)
      .map((r) => JSON.stringify([r.outcome_id, r.month, r.site_id, r.exposure_group_id, r.age_band, r.sex, Number(r.hours), r.cases]))
      .sort();
  const sumsAgree = async () => {
    const [row] = (await ds.query(`
      SELECT (SELECT count(*) FROM (
        SELECT intake_id, site_id, month, exposure_group_id, birth_year, sex, hours, entries FROM roster_sums
        EXCEPT
        SELECT r.intake_id, r.site_id, r.month, r.exposure_group_id, w.birth_year, w.sex, sum(r.hours), count(*)::int
        FROM roster_entries r JOIN workers w ON w.id = r.worker_id GROUP BY 1, 2, 3, 4, 5, 6) a)::int AS extra,
      (SELECT count(*) FROM (
        SELECT r.intake_id, r.site_id, r.month, r.exposure_group_id, w.birth_year, w.sex, sum(r.hours), count(*)::int
        FROM roster_entries r JOIN workers w ON w.id = r.worker_id GROUP BY 1, 2, 3, 4, 5, 6
        EXCEPT
        SELECT intake_id, site_id, month, exposure_group_id, birth_year, sex, hours, entries FROM roster_sums) b)::int AS missing`)) as Array<{
      extra: number;
      missing: number;
    }>;
    return row;
  };

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
        ['INJ', 'recurrent'],
        ['HEAR', 'first_event', 2],
      ],
    });
    const [a, b, u, x] = [await c.worker('a', 1980, 'M'), await c.worker('b', 1995, 'F'), await c.worker('u', null, null), await c.worker('x', 1960, 'X')];
    const [s1, s2] = c.sites as [number, number];
    const { REF, EXP } = c.groups as { REF: number; EXP: number };
    // Two statements for one intake: the second adds to sums the first created.
    await c.roster([
      [a, '2031-01-01', s1, EXP, 150.25],
      [b, '2031-01-01', s1, EXP, 80.5],
      [u, '2031-01-01', s2, REF, 160],
      [x, '2031-01-01', s2, EXP, 0],
    ]);
    await c.roster([
      [a, '2031-02-01', s1, EXP, 120],
      [b, '2031-02-01', s1, REF, 99.99],
      [u, '2031-02-01', s2, REF, 160],
      [x, '2031-02-01', s2, EXP, 44.75],
    ]);
    await c.cases([
      [a, c.outcomes.INJ!, '2031-02-10'],
      [b, c.outcomes.HEAR!, '2031-01-20'],
    ]);
  });

  afterAll(async () => {
    await clearCohortData(ds);
    await ds.destroy();
  });

  it('holds one row per intake × site × month × group × birth year × sex, unknown birth year and sex included', async () => {
    expect(await sumsAgree()).toEqual({ extra: 0, missing: 0 });
    const rows = (await ds.query(
      `SELECT month::text, hours::text, entries FROM roster_sums WHERE birth_year IS NULL AND sex IS NULL ORDER BY month`,
    )) as unknown[];
    expect(rows).toEqual([
      { month: '2031-01-01', hours: '160.00', entries: 1 },
      { month: '2031-02-01', hours: '160.00', entries: 1 },
    ]);
  });

  it('gives the run the cells that summing the entries gives', async () => {
    const fromSums = await cells(CELLS_SQL);
    expect(fromSums.length).toBeGreaterThan(5);
    expect(fromSums).toEqual(await cells(CELLS_FROM_ENTRIES_SQL));
  });

  it('gives the same cells when read together with the SIR counts (one statement for both)', async () => {
    await ds.query(`TRUNCATE reference_rate_tables CASCADE`);
    const [{ id }] = (await ds.query(
      `INSERT INTO reference_rate_tables (state, file_name, checksum, sources) VALUES ('applied', 'r.csv', repeat('a', 64), '{test}') RETURNING id`,
    )) as [{ id: number }];
    // Men 45–54 in 2031 only: worker a (born 1980, 51) is covered, the others are not.
    await ds.query(
      `INSERT INTO reference_rates (table_id, outcome_id, sex, age_from, age_to, year, rate, source) VALUES ($1, $2, 'M', 45, 54, 2031, 0.02, 'test')`,
      [id, c.outcomes.INJ],
    );
    const rows = (await ds.query(CELLS_AND_SIR_SQL, [...params, id])) as Array<Record<string, unknown>>;
    const cellRows = rows
      .filter((r) => r.kind === 'cell')
      .map((r) => JSON.stringify([r.outcome_id, r.month, r.site_id, r.exposure_group_id, r.age_band, r.sex, Number(r.hours), r.cases]))
      .sort();
    expect(cellRows).toEqual(await cells(CELLS_SQL));
    const sir = rows.filter((r) => r.kind === 'sir');
    // Every group of the outcome with hours has a row; only worker a's hours are covered: 150.25 h in
    // January and 120 h in February on site one, group EXP, with one case in February.
    expect(sir.every((r) => r.outcome_id === c.outcomes.INJ)).toBe(true);
    const covered = sir.filter((r) => Number(r.hours) > 0);
    expect(covered).toEqual([expect.objectContaining({ site_id: c.sites[0], exposure_group_id: c.groups.EXP, hours: '270.25', cases: 1 })]);
    expect(Number(covered[0]!.expected)).toBeCloseTo((270.25 / 2000) * 0.02, 12);
    expect(sir.filter((r) => Number(r.hours) === 0).every((r) => Number(r.hours_uncovered) > 0 && Number(r.expected) === 0)).toBe(true);
    await ds.query(`TRUNCATE reference_rate_tables CASCADE`);
  });

  it('follows a delete of entries, and empties with a truncate', async () => {
    await ds.query(`DELETE FROM roster_entries WHERE intake_id = $1 AND month = '2031-02-01' AND hours < 100`, [c.rosterIntake]);
    expect(await sumsAgree()).toEqual({ extra: 0, missing: 0 });
    expect(await cells(CELLS_SQL)).toEqual(await cells(CELLS_FROM_ENTRIES_SQL));
    const [{ n }] = (await ds.query(`SELECT count(*)::int AS n FROM roster_sums WHERE intake_id = $1`, [c.rosterIntake])) as [{ n: number }];
    expect(n).toBe(6); // January: (s1, EXP, 1980 M), (s1, EXP, 1995 F), (s2, REF, unknown), (s2, EXP, 1960 X); February: (s1, EXP, 1980 M), (s2, REF, unknown)
  });

  it('refuses to change an entry or a worker’s birth year or sex in place', async () => {
    await expect(ds.query(`UPDATE roster_entries SET hours = hours + 1 WHERE intake_id = $1`, [c.rosterIntake])).rejects.toThrow(/never changed in place/);
    await expect(ds.query(`UPDATE workers SET birth_year = 1981 WHERE worker_key = $1`, [`${c.tag}-a`])).rejects.toThrow(/never changed in place/);
    await expect(ds.query(`UPDATE workers SET sex = 'F' WHERE worker_key = $1`, [`${c.tag}-a`])).rejects.toThrow(/never changed in place/);
    // Other columns of a worker may change.
    await ds.query(`UPDATE workers SET birth_year = birth_year WHERE worker_key = $1`, [`${c.tag}-a`]);
  });

  it('empties with a truncate of the entries', async () => {
    await ds.query(`TRUNCATE roster_entries`);
    const [{ n }] = (await ds.query(`SELECT count(*)::int AS n FROM roster_sums`)) as [{ n: number }];
    expect(n).toBe(0);
  });
});

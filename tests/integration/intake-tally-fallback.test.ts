import { Readable } from 'node:stream';
import type { PoolClient } from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource, QueryRunner } from 'typeorm';
import { rosterStage, stageRoster } from '@ratewarden/api/features/intake/roster-stage';
import { openTestDataSource } from '../support/test-db';

/**
 * A roster with more workers (or site × months) than the stream tallies in memory (300,000 and
 * 50,000) has them computed by SQL from the staged rows instead. Both ways must stage the same
 * per-worker and per-slice tallies; here the limits are lowered so that a few rows reach the SQL
 * path, and the file is staged once each way.
 */
describe('intake: the SQL fallback for the roster tallies', () => {
  let ds: DataSource;
  let qr: QueryRunner;
  let client: PoolClient;
  const tag = `TF${Date.now().toString(36).toUpperCase()}`;
  const columns = ['worker_key', 'site', 'exposure_group', 'month', 'hours', 'birth_year', 'sex', 'job_title'];

  beforeAll(async () => {
    ds = await openTestDataSource();
    await ds.query(`INSERT INTO sites (code, name) VALUES ($1, 'Tally site A'), ($2, 'Tally site B')`, [`${tag}A`, `${tag}B`]);
    await ds.query(`INSERT INTO exposure_groups (code, name, hazard) VALUES ($1, 'Tally group', 'test')`, [`${tag}G`]);
    qr = ds.createQueryRunner();
    client = (await qr.connect()) as PoolClient;
    await client.query('BEGIN');
  });
  afterAll(async () => {
    await client.query('ROLLBACK');
    await qr.release();
    await ds.destroy();
  });

  // Five workers over two sites and three months, each worker's months in order; W5 changes birth
  // year and sex between rows (the checks later flag that; the tallies must carry min and max).
  const body = [
    ['W1', 'A', '2031-01', '160', '1980', 'F'],
    ['W1', 'A', '2031-02', '150.5', '1980', 'F'],
    ['W2', 'A', '2031-01', '80', '1975', 'M'],
    ['W2', 'B', '2031-03', '12.25', '1975', 'M'],
    ['W3', 'B', '2031-01', '100', '1990', 'X'],
    ['W3', 'B', '2031-02', '100', '1990', 'X'],
    ['W4', 'B', '2031-03', '0', '1969', 'F'],
    ['W5', 'A', '2031-01', '40', '1985', 'F'],
    ['W5', 'A', '2031-02', '40', '1986', 'M'],
  ]
    .map(([w, s, m, h, by, sex]) => `${tag}-${w},${tag}${s},${tag}G,${m},${h},${by},${sex},\n`)
    .join('');

  const stage = (name: string, limits?: { workers: number; slices: number }) =>
    stageRoster(client, name, columns, ',', '\n', Buffer.alloc(0), Readable.from([Buffer.from(body)]), limits);
  const tallies = async (name: string) => {
    const st = rosterStage(name);
    const workers = (await client.query(`SELECT k, by_min, by_max, sex_min, sex_max FROM ${st.workers} ORDER BY k`)).rows;
    const slices = (
      await client.query(`SELECT site_code, m, month::text, n::int, hours::numeric(12, 2)::text AS hours FROM ${st.slices} ORDER BY site_code, m`)
    ).rows;
    return { workers, slices };
  };

  it('stages the same worker and slice tallies from memory and from SQL', async () => {
    const inMemory = await stage('s_00000000000000000000000000000a01');
    const bySql = await stage('s_00000000000000000000000000000a02', { workers: 2, slices: 1 });
    expect(inMemory.rowCount).toBe(9);
    expect(bySql.rowCount).toBe(9);
    const a = await tallies('s_00000000000000000000000000000a01');
    const b = await tallies('s_00000000000000000000000000000a02');
    expect(b).toEqual(a);
    // Worked out from the rows above.
    expect(a.workers).toHaveLength(5);
    expect(a.workers.find((w) => w.k === `${tag}-W5`)).toEqual({ k: `${tag}-W5`, by_min: 1985, by_max: 1986, sex_min: 'F', sex_max: 'M' });
    expect(a.slices).toEqual([
      { site_code: `${tag}A`, m: '2031-01', month: '2031-01-01', n: 3, hours: '280.00' },
      { site_code: `${tag}A`, m: '2031-02', month: '2031-02-01', n: 2, hours: '190.50' },
      { site_code: `${tag}B`, m: '2031-01', month: '2031-01-01', n: 1, hours: '100.00' },
      { site_code: `${tag}B`, m: '2031-02', month: '2031-02-01', n: 1, hours: '100.00' },
      { site_code: `${tag}B`, m: '2031-03', month: '2031-03-01', n: 2, hours: '12.25' },
    ]);
    // Months in order spare the SQL duplicate check in memory; past the limits it always runs,
    // which also shows that the second staging took the SQL path.
    expect(inMemory.needsDuplicateCheck).toBe(false);
    expect(bySql.needsDuplicateCheck).toBe(true);
  });
});

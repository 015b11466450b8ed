import { randomBytes } from 'node:crypto';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createDataSource, migrate, seedNewDatabase } from '@ratewarden/db';
import { testDatabaseUrl } from '../support/test-db';

/**
 * `npm start -- --empty` on a new database (a scratch database beside the test one): no demo data,
 * only the first administrator; a later plain `npm start` does not load the demo over it.
 */
describe('an empty start', () => {
  const name = `rw_empty_${randomBytes(4).toString('hex')}`;
  const admin = new pg.Client({ connectionString: testDatabaseUrl() });
  let url: string;
  let ds: DataSource;

  beforeAll(async () => {
    await admin.connect();
    await admin.query(`CREATE DATABASE ${name}`);
    const u = new URL(testDatabaseUrl());
    u.pathname = `/${name}`;
    url = u.toString();
    await migrate(url);
    ds = createDataSource(url, 1);
    await ds.initialize();
  });
  afterAll(async () => {
    await ds?.destroy();
    await admin.query(`DROP DATABASE IF EXISTS ${name}`);
    await admin.end();
  });

  const count = async (table: string) => ((await ds.query(`SELECT count(*)::int AS n FROM ${table}`)) as [{ n: number }])[0].n;

  it('writes the first administrator only, once, and a later plain start loads no demo data over it', async () => {
    expect(await seedNewDatabase(ds, { empty: true, firstAdminEmail: 'first.admin@example.test' })).toBe('first administrator');
    expect(await ds.query(`SELECT email, role FROM users`)).toEqual([{ email: 'first.admin@example.test', role: 'administrator' }]);
    expect(await seedNewDatabase(ds, { empty: true, firstAdminEmail: 'someone.else@example.test' })).toBeNull();
    expect(await seedNewDatabase(ds, { empty: false, firstAdminEmail: 'first.admin@example.test' })).toBeNull();
    for (const table of ['sites', 'exposure_groups', 'outcomes', 'roster_entries', 'case_events', 'watch_rules']) expect(await count(table), table).toBe(0);
    expect(await count('users')).toBe(1);
  });
});

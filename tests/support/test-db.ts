import { createDataSource } from '@ratewarden/db';
import type { DataSource } from 'typeorm';

/** The test database prepared by `npm test` (scripts/test.ts); never the demo database. */
export function testDatabaseUrl(): string {
  const url = process.env.TEST_DATABASE_URL;
  if (!url) throw new Error('TEST_DATABASE_URL is not set: run the tests through `npm test`, which starts their database');
  return url;
}

export async function openTestDataSource(): Promise<DataSource> {
  const ds = createDataSource(testDatabaseUrl(), 4);
  await ds.initialize();
  return ds;
}

/** Every site's id: a reader of every site may see company-wide figures (other files' sites included). */
export async function allSiteIds(ds: DataSource): Promise<number[]> {
  return ((await ds.query(`SELECT id FROM sites ORDER BY id`)) as Array<{ id: number }>).map((s) => s.id);
}

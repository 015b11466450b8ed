import { afterAll, afterEach, beforeAll, describe, expect, inject, it } from 'vitest';
import type { DataSource, QueryRunner } from 'typeorm';
import { makeCorner, type Corner } from '../integration/intake-support';
import { clearCohortData } from '../integration/runs-fixture';
import { freePort } from '../support/free-port';
import { clientToken } from '../support/sign-in';
import { openTestDataSource, testDatabaseUrl } from '../support/test-db';
import { cohortTables, tableChecksums } from './support-checksums';
import { killHard, startChild, until, type Child } from './support-processes';
import { currentRosterSum, largeRoster, md5 } from './support-roster';

const APP_NAME = 'ratewarden-api-killed';
const WORKERS = 10_000; // × 12 months: 120,000 roster rows, about 4.5 MB

/**
 * Where the API process is killed while it applies a large roster. Each point is held by a lock
 * this test takes (the apply waits there, inside its transaction, so the kill lands mid-apply),
 * except the roster insert itself, which is caught while it runs. A lock on `run_requests`, the
 * apply's last write, is held throughout, so no kill can come after the commit.
 */
const killPoints = [
  { name: 'at the intake lock', hold: `SELECT pg_advisory_xact_lock(hashtext('ratewarden.intake.apply'))`, running: `%pg_advisory_xact_lock%`, waits: true },
  { name: 'before the new workers', hold: `LOCK TABLE workers IN SHARE MODE`, running: `%INSERT INTO workers%`, waits: true },
  { name: 'during the roster insert', hold: null, running: `%INSERT INTO roster_entries%`, waits: false },
  { name: 'before the site × month pointers', hold: `LOCK TABLE roster_slices IN SHARE MODE`, running: `%INSERT INTO roster_slices%`, waits: true },
  // The run request is written through its repository (db/src/run-requests.ts): TypeORM quotes the table name.
  { name: 'before the run request', hold: null, running: `%INSERT INTO "run_requests"%`, waits: true },
] as const;

describe('kill -9 of the API mid-apply', () => {
  let ds: DataSource;
  let c: Corner;
  let token: string;
  let api: Child | null = null;
  let port: number;

  async function startApi(): Promise<string> {
    port = await freePort();
    const base = `http://127.0.0.1:${port}`;
    api = startChild('api/src/server.ts', {
      DATABASE_URL: `${testDatabaseUrl()}?application_name=${APP_NAME}`,
      PORT: String(port),
      NODE_ENV: 'test',
      OIDC_ISSUER: inject('auth').issuer,
      OIDC_REDIRECT_URI: `${base}/auth/callback`,
      APP_BASE_URL: `${base}/`,
      INTAKE_RATE_LIMIT: '10000',
    });
    await until(
      'the API to listen',
      async () => api!.output().includes('listening on') || (api!.process.exitCode !== null && Promise.reject(new Error(`the API exited: ${api!.output()}`))),
    );
    return base;
  }

  const post = (base: string, path: string, body?: FormData) =>
    fetch(`${base}${path}`, { method: 'POST', headers: { authorization: `Bearer ${token}` }, body });
  const upload = (base: string, mode: 'check' | 'apply', csv: string, fileName: string) => {
    const form = new FormData();
    form.append('file', new Blob([csv], { type: 'text/csv' }), fileName);
    return post(base, `/api/intakes?kind=roster&mode=${mode}`, form);
  };
  const backends = async () =>
    (await ds.query(`SELECT state, wait_event_type, query FROM pg_stat_activity WHERE application_name = $1 AND xact_start IS NOT NULL`, [APP_NAME])) as Array<{
      state: string;
      wait_event_type: string | null;
      query: string;
    }>;

  beforeAll(async () => {
    ds = await openTestDataSource();
    await clearCohortData(ds);
    c = await makeCorner(ds);
    await ds.query(`INSERT INTO integration_clients (client_id, name) VALUES ('hr-sync-demo', 'HR') ON CONFLICT DO NOTHING`);
    token = await clientToken(inject('auth').issuer);
  });
  afterEach(async () => {
    if (api) await killHard(api.process);
    api = null;
  });
  afterAll(async () => {
    await ds.destroy();
  });

  it('leaves the store as it was before, at every kill point, and the next apply stores the whole roster', async () => {
    const spec = { prefix: c.codes.W, site: c.codes.S1, groups: [c.codes.GA, c.codes.GB] as [string, string], workers: WORKERS };
    const v0 = largeRoster({ ...spec, version: 0 });
    const v1 = largeRoster({ ...spec, version: 1 });
    let base = await startApi();
    // The stored version the apply replaces, then the corrected file, checked.
    const stored = await upload(base, 'apply', v0.csv, 'roster-2019.csv');
    expect(stored.status, JSON.stringify(await stored.clone().json()).slice(0, 600)).toBe(201);
    const checked = await upload(base, 'check', v1.csv, 'roster-2019-corrected.csv');
    expect(checked.status).toBe(201);
    const intakeId = ((await checked.json()) as { intake: { id: string; state: string } }).intake.id;
    await killHard(api!.process);

    const before = await tableChecksums(ds, cohortTables);
    expect(await currentRosterSum(ds, c.siteIds[0]!)).toBe(md5(v0.content));
    let kills = 0;
    let asBefore = 0;
    for (const point of killPoints) {
      base = await startApi();
      const holder: QueryRunner = ds.createQueryRunner();
      await holder.connect();
      await holder.startTransaction();
      await holder.query(`LOCK TABLE run_requests IN SHARE MODE`);
      if (point.hold) await holder.query(point.hold);
      const applying = post(base, `/api/intakes/${intakeId}/apply`).then(
        (r) => r.status,
        () => 'connection lost',
      );
      await until(`the apply to reach ${point.name}`, async () =>
        (await backends()).some(
          (b) => b.query.includes(point.running.replaceAll('%', '')) && (point.waits ? b.wait_event_type === 'Lock' : b.state === 'active'),
        ),
      );
      await killHard(api!.process);
      api = null;
      kills++;
      expect(await applying).toBe('connection lost');
      await holder.rollbackTransaction();
      await holder.release();
      // The killed API's backend finds its client gone and rolls back; nothing commits without the client's COMMIT.
      await until(
        "the killed API's connections to close",
        async () =>
          ((await ds.query(`SELECT count(*)::int AS n FROM pg_stat_activity WHERE application_name = $1`, [APP_NAME])) as Array<{ n: number }>)[0]!.n === 0,
      );
      expect(await tableChecksums(ds, cohortTables), `store after the kill ${point.name}`).toEqual(before);
      asBefore++;
    }

    // Restarted, the API applies the same checked intake in full.
    base = await startApi();
    const applied = await post(base, `/api/intakes/${intakeId}/apply`);
    expect(applied.status).toBe(200);
    expect(((await applied.json()) as { state: string }).state).toBe('applied');
    const after = await tableChecksums(ds, cohortTables);
    expect(after.roster_entries).not.toBe(before.roster_entries);
    expect(await currentRosterSum(ds, c.siteIds[0]!)).toBe(md5(v1.content));
    const rows = v1.content.split('\n').length;
    console.log(
      `reliability: kill -9 of the API mid-apply of a ${rows.toLocaleString('en')}-row roster: ${kills} kills (${killPoints.map((p) => p.name).join(', ')}), ${asBefore} left the store exactly as before, 0 in between; the next apply stored all ${rows.toLocaleString('en')} rows`,
    );
  });
});

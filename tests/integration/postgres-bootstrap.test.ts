import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import net from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import pg from 'pg';
import { afterAll, describe, expect, it } from 'vitest';
import { SetupError } from '../../scripts/lib/log';
import { startPostgres } from '../../scripts/lib/postgres';
import { freePort } from '../support/free-port';

/** The project's own PostgreSQL bootstrap, on a scratch cluster: faults give one clear line or are recovered from. */
describe('PostgreSQL bootstrap', () => {
  const folder = mkdtempSync(join(tmpdir(), 'rw-pg-bootstrap-'));
  afterAll(() => rmSync(folder, { recursive: true, force: true }));

  it('refuses a taken port with one clear line naming PGPORT', async () => {
    const blocker = net.createServer();
    const port = await new Promise<number>((resolve) => blocker.listen(0, '127.0.0.1', () => resolve((blocker.address() as net.AddressInfo).port)));
    try {
      const attempt = startPostgres({ folder, port, database: 'probe', durable: false });
      await expect(attempt).rejects.toBeInstanceOf(SetupError);
      await expect(attempt).rejects.toThrow(new RegExp(`port ${port} .*already in use.*PGPORT`));
    } finally {
      blocker.close();
    }
  });

  it('recovers from a stale postmaster.pid left by a crash, and answers on loopback', async () => {
    writeFileSync(join(folder, 'pgdata', 'postmaster.pid'), '999999\n/nowhere\n');
    const port = await freePort();
    const db = await startPostgres({ folder, port, database: 'probe', durable: false });
    try {
      const client = new pg.Client({ connectionString: db.url });
      await client.connect();
      const { rows } = await client.query(`SELECT current_setting('listen_addresses') AS listen`);
      await client.end();
      expect(rows[0].listen).toBe('127.0.0.1');
    } finally {
      db.stop();
    }
  });
});

import { get, type IncomingMessage, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createApp } from '@ratewarden/api/app';
import { passIdentityProvider, provisionUser } from '../support/sign-in';
import { testApiConfig } from '../support/test-config';
import { openTestDataSource } from '../support/test-db';

const sessionCookie = (setCookie: string[] | undefined) => setCookie?.map((c) => c.split(';')[0]!).find((c) => c.startsWith('rw.sid='));

/**
 * A browser follows the callback's redirect as soon as the headers arrive, and the page it lands on
 * asks for the session at once: the session must already be stored by then. The test database runs
 * without fsync, so its commits are instant; a trigger gives session writes the 50 ms a busy
 * disk's commit can take, which opens the window a real server has.
 */
describe('the session right after sign-in', () => {
  let ds: DataSource;
  let server: Server;
  let base: string;

  beforeAll(async () => {
    ds = await openTestDataSource();
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist');
    await ds.query(`CREATE OR REPLACE FUNCTION test_slow_session_write() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN PERFORM pg_sleep(0.05); RETURN NEW; END $$`);
    await ds.query(
      `CREATE OR REPLACE TRIGGER test_slow_session_write BEFORE INSERT OR UPDATE ON user_sessions FOR EACH ROW EXECUTE FUNCTION test_slow_session_write()`,
    );
    const app = createApp({ dataSource: ds, config: testApiConfig() });
    server = await new Promise<Server>((resolve) => {
      const s = app.listen(0, '127.0.0.1', () => resolve(s));
    });
    base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  });
  afterAll(async () => {
    server.closeAllConnections();
    await new Promise((r) => server.close(r));
    await ds.query(`DROP TRIGGER IF EXISTS test_slow_session_write ON user_sessions`);
    await ds.query(`DROP FUNCTION IF EXISTS test_slow_session_write()`);
    await ds.destroy();
  });

  /** Signs in and, the moment the callback's headers arrive, asks for the session `readers` times at once. */
  async function signInAndReadAtOnce(readers: number): Promise<{ signedIn: string; reads: Array<{ user: unknown; cookie: string | undefined }> }> {
    const login = await fetch(`${base}/auth/login`, { redirect: 'manual' });
    const loginCookie = sessionCookie(login.headers.getSetCookie())!;
    const callback = await passIdentityProvider(new URL(login.headers.get('location')!), 'hygienist@demo.ratewarden.test');
    const response = await new Promise<IncomingMessage>((resolve, reject) => {
      get(`${base}${callback.pathname}${callback.search}`, { headers: { cookie: loginCookie } }, resolve).once('error', reject);
    });
    expect(response.statusCode).toBe(302);
    const signedIn = sessionCookie(response.headers['set-cookie'])!;
    const reads = await Promise.all(
      Array.from({ length: readers }, async () => {
        const res = await fetch(`${base}/api/session`, { headers: { cookie: signedIn } });
        return { user: ((await res.json()) as { user: unknown }).user, cookie: sessionCookie(res.headers.getSetCookie()) };
      }),
    );
    response.resume();
    return { signedIn, reads };
  }

  it('every request fired as the callback answers sees the person, and none replaces the signed-in cookie', async () => {
    for (let round = 0; round < 4; round++) {
      const { signedIn, reads } = await signInAndReadAtOnce(5);
      expect(signedIn).toMatch(/^rw\.sid=/);
      for (const read of reads) {
        expect(read.user).toMatchObject({ email: 'hygienist@demo.ratewarden.test' });
        if (read.cookie !== undefined) expect(read.cookie).toBe(signedIn);
      }
    }
  });
});

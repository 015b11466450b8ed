import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createApp } from '@ratewarden/api/app';
import { provisionUser, signIn } from '../support/sign-in';
import { testApiConfig } from '../support/test-config';
import { allSiteIds, openTestDataSource } from '../support/test-db';

/**
 * A rolling session's stored expiry is written back at most once a minute per process
 * (api/src/auth/sessions.ts, TOUCH_EVERY_SECONDS), not on every read: reads a second apart leave it
 * alone after the first. express-session would otherwise write it on each of them.
 */
describe('session expiry written back at most once a minute', () => {
  let ds: DataSource;
  beforeAll(async () => {
    ds = await openTestDataSource();
  });
  afterAll(async () => {
    await ds.destroy();
  });

  it('writes the expiry on the first read, then not again within the minute', async () => {
    const app = createApp({ dataSource: ds, config: testApiConfig() });
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', await allSiteIds(ds));
    const { agent } = await signIn(app, 'hygienist@demo.ratewarden.test');
    const read = await agent.get('/api/session').expect(200);
    // The session id from the signed cookie "rw.sid=s:<sid>.<signature>" of a rolling session's answer.
    const sid = /rw\.sid=s%3A([^.;]+)\./.exec(String(read.headers['set-cookie']))?.[1];
    expect(sid).toBeTruthy();
    const expiries = async () =>
      ((await ds.query(`SELECT expire FROM user_sessions WHERE sid = $1`, [sid])) as Array<{ expire: Date }>).map((r) => r.expire.getTime());
    const first = await expiries();
    expect(first).toHaveLength(1);
    for (let i = 0; i < 2; i++) {
      await new Promise((r) => setTimeout(r, 1100));
      await agent.get('/api/session').expect(200);
    }
    expect(await expiries()).toEqual(first);
  });
});

import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { createApp } from '@ratewarden/api/app';
import { testApiConfig } from '../support/test-config';
import { openTestDataSource } from '../support/test-db';

/** The sign-in limit counts per client address; X-Forwarded-For is believed only from a configured proxy. */
describe('sign-in rate limit and proxies', () => {
  const tryLogins = async (trustProxy: string | undefined) => {
    const ds = await openTestDataSource();
    try {
      const app = createApp({ dataSource: ds, config: testApiConfig({ AUTH_RATE_LIMIT: '3', TRUST_PROXY: trustProxy }) });
      const statuses: number[] = [];
      for (let i = 1; i <= 5; i++) statuses.push((await request(app).get('/auth/login').set('x-forwarded-for', `203.0.113.${i}`)).status);
      return statuses;
    } finally {
      await ds.destroy();
    }
  };

  it('by default a made-up X-Forwarded-For does not give a client a fresh allowance', async () => {
    expect(await tryLogins(undefined)).toEqual([302, 302, 302, 429, 429]);
  });

  it('behind a configured proxy (TRUST_PROXY=loopback) each forwarded client has its own allowance', async () => {
    expect(await tryLogins('loopback')).toEqual([302, 302, 302, 302, 302]);
  });
});

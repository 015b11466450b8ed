import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource, QueryRunner } from 'typeorm';
import { createApp } from '@ratewarden/api/app';
import { createDataSource } from '@ratewarden/db';
import { allSiteIds, testDatabaseUrl } from '../support/test-db';
import { provisionUser, signIn, type SignedInAgent } from '../support/sign-in';
import { testApiConfig } from '../support/test-config';

/**
 * A saturated database answered as such: with every connection of the pool busy, requests wait
 * for one up to DB_POOL_WAIT_MS and then get 503 with Retry-After; beyond DB_QUEUE_MAX waiting
 * requests a new one gets 503 at once. Never a 500, and the API answers normally once a
 * connection is free again. (The sizes here are tiny so the test can fill them.)
 */
describe('the API under load', () => {
  let ds: DataSource;
  let hygienist: SignedInAgent;
  let holder: QueryRunner | null = null;

  beforeAll(async () => {
    ds = createDataSource(testDatabaseUrl(), 1, 400);
    await ds.initialize();
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', await allSiteIds(ds));
    hygienist = await signIn(createApp({ dataSource: ds, config: testApiConfig(), dbQueueMax: 2 }), 'hygienist@demo.ratewarden.test');
  });
  afterAll(async () => {
    await holder?.release();
    await ds.destroy();
  });

  it('compresses JSON answers larger than 1 KiB', async () => {
    const res = await hygienist.agent.get('/api/intakes/formats').set('accept-encoding', 'gzip').expect(200);
    expect(res.headers['content-encoding']).toBe('gzip');
    expect(Array.isArray(res.body.roster)).toBe(true);
  });

  it('answers 503 with Retry-After, at once beyond the queue bound and after the wait within it, then recovers', async () => {
    await hygienist.agent.get('/api/groups').expect(200);
    // Take the pool's only connection, as a long apply would.
    holder = ds.createQueryRunner();
    await holder.connect();
    await holder.query('SELECT 1');

    const started = Date.now();
    const answers = await Promise.all(
      Array.from({ length: 8 }, async () => {
        const res = await hygienist.agent.get('/api/groups');
        return {
          status: res.status,
          retryAfter: res.headers['retry-after'] as string | undefined,
          code: (res.body as { code?: string }).code,
          ms: Date.now() - started,
        };
      }),
    );
    expect(answers.every((a) => a.status === 503 && a.retryAfter === '2' && a.code === 'service_unavailable')).toBe(true);
    // Two waited for a connection (the queue bound) until the pool's wait ran out; the rest were refused at once.
    const waited = answers.filter((a) => a.ms >= 380);
    expect(waited.length).toBe(2);
    expect(answers.filter((a) => a.ms < 380).length).toBe(6);

    await holder.release();
    holder = null;
    await hygienist.agent.get('/api/groups').expect(200);
  });
});

import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '@ratewarden/api/app';
import { readApiConfig } from '@ratewarden/api/config';
import { createDataSource } from '@ratewarden/db';
import { healthSchema, problemSchema, RATEWARDEN_VERSION } from '@ratewarden/shared';
import type { DataSource } from 'typeorm';
import { openTestDataSource } from '../support/test-db';

const config = readApiConfig({ NODE_ENV: 'test' });

describe('/api/health against the real database', () => {
  let ds: DataSource;
  beforeAll(async () => {
    ds = await openTestDataSource();
  });
  afterAll(async () => {
    await ds.destroy();
  });

  it('answers ok with the version when PostgreSQL is up', async () => {
    const res = await request(createApp({ dataSource: ds, config }))
      .get('/api/health')
      .expect(200);
    expect(healthSchema.parse(res.body)).toEqual({ status: 'ok', db: 'ok', version: RATEWARDEN_VERSION });
  });

  it('answers 503 with db "down" when PostgreSQL is unreachable', async () => {
    const unreachable = createDataSource('postgres://ratewarden@127.0.0.1:1/none', 1);
    await unreachable.initialize().catch(() => undefined);
    const res = await request(createApp({ dataSource: unreachable, config }))
      .get('/api/health')
      .expect(503);
    expect(res.body).toMatchObject({ status: 'degraded', db: 'down' });
  });

  it('turns an unknown API route into a JSON problem, not an HTML page', async () => {
    const res = await request(createApp({ dataSource: ds, config }))
      .get('/api/no-such-thing')
      .expect(404);
    expect(res.headers['content-type']).toMatch(/application\/json/);
    expect(problemSchema.parse(res.body).code).toBe('not_found');
  });

  it('reports a malformed JSON body as a problem without internals', async () => {
    const res = await request(createApp({ dataSource: ds, config }))
      .post('/api/health')
      .set('content-type', 'application/json')
      .send('{"broken":')
      .expect(400);
    expect(res.body).toEqual({ code: 'bad_request', message: 'the request could not be read' });
    expect(JSON.stringify(res.body)).not.toMatch(/at .*\.ts|SyntaxError/);
  });

  it('serves the built web app for client-side routes', async () => {
    const res = await request(createApp({ dataSource: ds, config }))
      .get('/some/page')
      .expect(200);
    expect(res.text).toContain('<div id="root">');
  });

  it('has applied the foundation migration and keeps the audit log append-only', async () => {
    await ds.query(`INSERT INTO audit_events (actor_label, action) VALUES ('test', 'test.append')`);
    await expect(ds.query(`UPDATE audit_events SET action = 'rewritten'`)).rejects.toThrow(/append-only/);
    await expect(ds.query(`DELETE FROM audit_events`)).rejects.toThrow(/append-only/);
  });
});

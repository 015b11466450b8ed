import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createApp } from '@ratewarden/api/app';
import { sessionSchema } from '@ratewarden/shared/session';
import { provisionUser, signIn } from '../support/sign-in';
import { testApiConfig } from '../support/test-config';
import { openTestDataSource } from '../support/test-db';

/** A session row is stored only once there is something to keep: nobody reading anonymously fills the table. */
describe('sessions of anonymous readers', () => {
  let ds: DataSource;
  let app: ReturnType<typeof createApp>;
  const rowCount = async () => ((await ds.query(`SELECT count(*)::int AS n FROM user_sessions`)) as Array<{ n: number }>)[0]!.n;

  beforeAll(async () => {
    ds = await openTestDataSource();
    await provisionUser(ds, 'admin@demo.ratewarden.test', 'administrator');
    app = createApp({ dataSource: ds, config: testApiConfig() });
  });
  afterAll(async () => {
    await ds.destroy();
  });

  it('stores no row and sets no cookie for anonymous requests, and offers no CSRF token without a person', async () => {
    const before = await rowCount();
    const answers = await Promise.all(
      Array.from({ length: 60 }, (_, i) =>
        i % 3 === 0 ? request(app).get('/api/session') : i % 3 === 1 ? request(app).get('/api/groups') : request(app).post('/api/rules').send({ name: 'x' }),
      ),
    );
    expect(answers.map((a) => a.status).sort()).toEqual([...Array(20).fill(200), ...Array(40).fill(401)]);
    for (const a of answers) expect(a.headers['set-cookie']).toBeUndefined();
    expect(sessionSchema.parse(answers[0]!.body)).toMatchObject({ user: null, csrfToken: null });
    expect(await rowCount()).toBe(before);
  });

  it("keeps a signed-in person's session and CSRF token, and still refuses their writes without it", async () => {
    const before = await rowCount();
    const { agent, csrf } = await signIn(app, 'admin@demo.ratewarden.test');
    expect(await rowCount()).toBe(before + 1);
    expect(csrf).toMatch(/^[\w-]{32}$/);
    expect((await agent.get('/api/session').expect(200)).body.csrfToken).toBe(csrf);
    const refused = await agent.post('/api/admin/clients').send({ clientId: 'anon-probe', name: 'probe' }).expect(403);
    expect(refused.body.details).toEqual({ reason: 'csrf' });
  });
});

import { randomBytes } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createApp } from '@ratewarden/api/app';
import { performRun } from '@ratewarden/worker/runs/perform-run';
import { provisionUser, signIn, type SignedInAgent } from '../support/sign-in';
import { testApiConfig } from '../support/test-config';
import { allSiteIds, openTestDataSource } from '../support/test-db';
import { settings } from './runs-fixture';

/**
 * The lists of sites, exposure groups and outcomes (`config` counter of data_versions) and the
 * run history and the pending run (`runs` counter) are kept per reader and counter: the same tag gives 304, and a
 * write through the API, one straight in the database or a new run changes the answer at once
 * (the old tag then gets a 200 with the new list, never a 304).
 */
describe('config lists and run history: kept per data version', () => {
  let ds: DataSource;
  let admin: SignedInAgent;
  let hyg: SignedInAgent;
  const tag = randomBytes(3).toString('hex').toUpperCase();

  const get = async (who: SignedInAgent, url: string, ifNoneMatch?: string) => {
    const req = who.agent.get(url);
    const res = await (ifNoneMatch ? req.set('if-none-match', ifNoneMatch) : req);
    return { status: res.status, tag: res.headers.etag as string, body: res.body as Array<Record<string, unknown>> };
  };

  beforeAll(async () => {
    ds = await openTestDataSource();
    const app = createApp({ dataSource: ds, config: testApiConfig() });
    await provisionUser(ds, 'admin@demo.ratewarden.test', 'administrator');
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', await allSiteIds(ds));
    admin = await signIn(app, 'admin@demo.ratewarden.test');
    hyg = await signIn(app, 'hygienist@demo.ratewarden.test');
  });
  afterAll(async () => ds?.destroy());

  it('answers 304 to the same tag, and a site created through the API shows at once', async () => {
    const first = await get(hyg, '/api/sites');
    expect(first.status).toBe(200);
    expect((await get(hyg, '/api/sites', first.tag)).status).toBe(304);
    await admin.agent
      .post('/api/sites')
      .set('x-csrf-token', admin.csrf)
      .send({ code: `C${tag}`, name: 'Cache test site' })
      .expect(201);
    const after = await get(hyg, '/api/sites', first.tag);
    expect(after.status).toBe(200);
    expect(after.tag).not.toBe(first.tag);
    expect(after.body.map((s) => s.code)).toContain(`C${tag}`);
  });

  it('shows a group and an outcome written straight in the database at once', async () => {
    const groups = await get(hyg, '/api/groups');
    const outcomes = await get(hyg, '/api/outcomes');
    await ds.query(`INSERT INTO exposure_groups (code, name, hazard) VALUES ($1, 'Cache test group', 'test')`, [`G${tag}`]);
    await ds.query(`INSERT INTO outcomes (code, name, case_definition, counting_rule) VALUES ($1, 'Cache test outcome', 'test', 'recurrent')`, [`O${tag}`]);
    const g = await get(hyg, '/api/groups', groups.tag);
    const o = await get(hyg, '/api/outcomes', outcomes.tag);
    expect(g.status).toBe(200);
    expect(g.body.map((x) => x.code)).toContain(`G${tag}`);
    expect(o.status).toBe(200);
    expect(o.body.map((x) => x.code)).toContain(`O${tag}`);
  });

  it('shows a run requested and a run request picked up, both straight in the database, in the pending run at once', async () => {
    const count = (body: unknown) => (body as { pending: { count: number } | null }).pending?.count ?? 0;
    const before = await get(hyg, '/api/runs/pending');
    expect((await get(hyg, '/api/runs/pending', before.tag)).status).toBe(304);
    const [{ id }] = (await ds.query(`INSERT INTO run_requests (reason, immediate) VALUES ('cache test', true) RETURNING id`)) as [{ id: string }];
    const requested = await get(hyg, '/api/runs/pending', before.tag);
    expect(requested.status).toBe(200);
    expect(count(requested.body)).toBe(count(before.body) + 1);
    expect(requested.body).toMatchObject({ pending: { immediate: true } });
    await ds.query(`UPDATE run_requests SET picked_at = now() WHERE id = $1`, [id]);
    const picked = await get(hyg, '/api/runs/pending', requested.tag);
    expect(picked.status).toBe(200);
    expect(count(picked.body)).toBe(count(before.body));
  });

  it('shows a new run in the history at once', async () => {
    const before = await get(hyg, '/api/runs');
    expect((await get(hyg, '/api/runs', before.tag)).status).toBe(304);
    const outcome = await performRun(ds, { trigger: 'cli', settings, appUrl: 'http://127.0.0.1/' });
    expect(outcome.status).toBe('succeeded');
    const after = await get(hyg, '/api/runs', before.tag);
    expect(after.status).toBe(200);
    expect(after.body[0]!.id).toBe((outcome as { runId: string }).runId);
  });
});

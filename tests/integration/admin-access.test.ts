import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createApp } from '@ratewarden/api/app';
import { adminUserSchema } from '@ratewarden/shared/admin';
import { provisionUser, signIn, type SignedInAgent } from '../support/sign-in';
import { testApiConfig } from '../support/test-config';
import { openTestDataSource } from '../support/test-db';

/** The administrator changes a person's role and sites through PATCH /api/admin/users/:id. */
describe("changing a person's access", () => {
  let ds: DataSource;
  let admin: SignedInAgent;
  let siteIds: number[];
  let personId: string;
  let adminId: string;

  beforeAll(async () => {
    ds = await openTestDataSource();
    const sites = (await ds.query(
      `INSERT INTO sites (code, name) VALUES ('ACC-A', 'Access site A'), ('ACC-B', 'Access site B') ON CONFLICT (code) DO UPDATE SET name = EXCLUDED.name RETURNING id`,
    )) as Array<{ id: number }>;
    siteIds = sites.map((s) => s.id);
    personId = await provisionUser(ds, 'access-change@kestrelmoor.test', 'hygienist', [siteIds[0]!]);
    adminId = await provisionUser(ds, 'admin@demo.ratewarden.test', 'administrator');
    admin = await signIn(createApp({ dataSource: ds, config: testApiConfig() }), 'admin@demo.ratewarden.test');
  });
  afterAll(async () => {
    await ds.destroy();
  });

  it('stores the new role and sites, answers with the person, and audits the change', async () => {
    const res = await admin.agent
      .patch(`/api/admin/users/${personId}`)
      .set('x-csrf-token', admin.csrf)
      .send({ role: 'safety_manager', siteIds: [siteIds[1]] });
    expect(res.status).toBe(200);
    expect(adminUserSchema.parse(res.body)).toMatchObject({ email: 'access-change@kestrelmoor.test', role: 'safety_manager', siteIds: [siteIds[1]] });
    const [stored] = (await ds.query(
      `SELECT u.role, array_agg(us.site_id ORDER BY us.site_id) AS sites FROM users u LEFT JOIN user_sites us ON us.user_id = u.id WHERE u.id = $1 GROUP BY u.role`,
      [personId],
    )) as Array<{ role: string; sites: number[] }>;
    expect(stored).toEqual({ role: 'safety_manager', sites: [siteIds[1]] });
    const audits = (await ds.query(`SELECT count(*)::int AS n FROM audit_events WHERE actor_label = 'admin@demo.ratewarden.test' AND target LIKE $1`, [
      `%${personId}%`,
    ])) as Array<{ n: number }>;
    expect(audits[0]!.n).toBeGreaterThan(0);
  });

  it('takes the role away (no role, no sites) and refuses an unknown site or person', async () => {
    const none = await admin.agent.patch(`/api/admin/users/${personId}`).set('x-csrf-token', admin.csrf).send({ role: null, siteIds: [] });
    expect(none.status).toBe(200);
    expect(none.body).toMatchObject({ role: null, siteIds: [] });
    const badSite = await admin.agent
      .patch(`/api/admin/users/${personId}`)
      .set('x-csrf-token', admin.csrf)
      .send({ role: 'hygienist', siteIds: [2_000_000_000] });
    expect(badSite.status).toBeGreaterThanOrEqual(400);
    expect(badSite.status).toBeLessThan(500);
    const nobody = await admin.agent
      .patch('/api/admin/users/00000000-0000-4000-8000-000000000000')
      .set('x-csrf-token', admin.csrf)
      .send({ role: 'hygienist', siteIds: [] });
    expect(nobody.status).toBe(404);
  });

  it('refuses an administrator taking their own administrator role away', async () => {
    const res = await admin.agent.patch(`/api/admin/users/${adminId}`).set('x-csrf-token', admin.csrf).send({ role: 'hygienist', siteIds: [] });
    expect(res.status).toBe(409);
    const [me] = (await ds.query(`SELECT role FROM users WHERE id = $1`, [adminId])) as Array<{ role: string }>;
    expect(me!.role).toBe('administrator');
  });

  it('reads audit entries without counts or measure values, old entries included (the log itself is append-only)', async () => {
    const target = `flag:legacy-${Date.now()}`;
    // As written before entries stopped carrying them: a physician's read of 3 cases, a flag raised at a value of 12.5.
    await ds.query(
      `INSERT INTO audit_events (actor_label, action, target, detail) VALUES ('physician@demo.ratewarden.test', 'cases.read', $1, '{"count": 3}'), ('system', 'flag.raise', $1, '{"runId": "r", "value": 12.5, "period": "2031-05-01"}')`,
      [target],
    );
    const mine: Array<{ action: string; target: string; detail: Record<string, unknown> }> = [];
    for (const action of ['cases.read', 'flag.raise']) {
      const res = await admin.agent.get('/api/admin/audit').query({ action }).expect(200);
      mine.push(...(res.body as typeof mine).filter((e) => e.target === target));
    }
    expect(mine.map((e) => e.action).sort()).toEqual(['cases.read', 'flag.raise']);
    expect(mine.find((e) => e.action === 'flag.raise')!.detail).toEqual({ runId: 'r', period: '2031-05-01' });
    expect(mine.find((e) => e.action === 'cases.read')!.detail).toEqual({});
  });

  it('names the person who acted and what they acted on, and finds entries by part of a name', async () => {
    await ds.query(`UPDATE users SET name = 'Ines Okafor' WHERE id = $1`, [personId]);
    await ds.query(`UPDATE users SET name = 'Ada Quillfeather' WHERE id = $1`, [adminId]);
    await admin.agent.patch(`/api/admin/users/${personId}`).set('x-csrf-token', admin.csrf).send({ role: 'hygienist', siteIds }).expect(200);
    // "Quill" is in the administrator's name, not in the e-mail the entry was written with.
    const res = await admin.agent.get('/api/admin/audit').query({ action: 'user.access_changed', actor: 'Quill' }).expect(200);
    const entry = (res.body as Array<{ actor: string; actorName: string | null; target: string; targetName: string | null }>).find(
      (e) => e.target === `user:${personId}`,
    );
    expect(entry).toMatchObject({ actor: 'admin@demo.ratewarden.test', actorName: 'Ada Quillfeather', targetName: 'Ines Okafor' });
  });
});

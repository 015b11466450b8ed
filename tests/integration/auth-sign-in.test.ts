import { SignJWT, generateKeyPair } from 'jose';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, inject, it, vi } from 'vitest';
import { createApp } from '@ratewarden/api/app';
import type { DataSource } from 'typeorm';
import { clientToken, provisionUser, signIn } from '../support/sign-in';
import { testApiConfig } from '../support/test-config';
import { openTestDataSource } from '../support/test-db';

describe('sign-in through the OpenID Connect provider', () => {
  let ds: DataSource;
  let app: ReturnType<typeof createApp>;
  let siteIds: number[];

  beforeAll(async () => {
    ds = await openTestDataSource();
    await ds.query(`TRUNCATE user_sessions, user_sites, integration_clients`);
    const sites: { id: number }[] = await ds.query(
      `INSERT INTO sites (code, name) VALUES ('AUTH-A', 'Site A'), ('AUTH-B', 'Site B') ON CONFLICT (code) DO UPDATE SET name = EXCLUDED.name RETURNING id`,
    );
    siteIds = sites.map((s) => s.id);
    await provisionUser(ds, 'safety@demo.ratewarden.test', 'safety_manager', [siteIds[0]!]);
    await provisionUser(ds, 'admin@demo.ratewarden.test', 'administrator');
    app = createApp({ dataSource: ds, config: testApiConfig() });
  });
  afterAll(async () => {
    await ds.destroy();
  });

  it("tells the screen the server's small-cell threshold in the session, signed in or not", async () => {
    const anonymous = await request(app).get('/api/session').expect(200);
    expect(anonymous.body).toMatchObject({ user: null, smallCellThreshold: 5 });
    const strict = createApp({ dataSource: ds, config: testApiConfig({ SMALL_CELL_THRESHOLD: '11' }) });
    expect((await request(strict).get('/api/session').expect(200)).body.smallCellThreshold).toBe(11);
  });

  it('signs a provisioned person in with their role and sites, and audits it', async () => {
    const { agent } = await signIn(app, 'safety@demo.ratewarden.test');
    const session = await agent.get('/api/session').expect(200);
    expect(session.body.user).toMatchObject({ email: 'safety@demo.ratewarden.test', role: 'safety_manager', siteIds: [siteIds[0]] });
    const audit: { action: string }[] = await ds.query(
      `SELECT action FROM audit_events WHERE actor_label = 'safety@demo.ratewarden.test' AND action = 'auth.sign_in'`,
    );
    expect(audit.length).toBeGreaterThan(0);
  });

  it('gives an unknown person an account with no role, which reaches nothing', async () => {
    const { agent } = await signIn(app, 'newcomer@demo.ratewarden.test');
    const session = await agent.get('/api/session').expect(200);
    expect(session.body.user).toMatchObject({ email: 'newcomer@demo.ratewarden.test', role: null, siteIds: [] });
    await agent.get('/api/admin/users').expect(403);
  });

  it('returns to the page asked for after sign-in, but never to another site (open redirect)', async () => {
    expect((await signIn(app, 'admin@demo.ratewarden.test', undefined, '/admin/audit?action=auth')).landing).toBe('/admin/audit?action=auth');
    for (const away of ['//evil.example/', '/\\evil.example/', 'https://evil.example/']) {
      expect((await signIn(app, 'admin@demo.ratewarden.test', undefined, away)).landing, away).toBe('/');
    }
  });

  it('refuses a wrong password at the identity provider', async () => {
    await expect(signIn(app, 'admin@demo.ratewarden.test', 'not-the-password')).rejects.toThrow(/refused/);
  });

  it('keeps the session in PostgreSQL with a httpOnly, SameSite=Lax cookie', async () => {
    // Starting a sign-in is the first thing worth keeping (the return address and the OIDC state).
    const res = await request(app).get('/auth/login').expect(302);
    const cookie = String(res.headers['set-cookie']);
    expect(cookie).toMatch(/rw\.sid=/);
    expect(cookie).toMatch(/HttpOnly/);
    expect(cookie).toMatch(/SameSite=Lax/);
    const [{ count }] = (await ds.query(`SELECT count(*)::int AS count FROM user_sessions`)) as [{ count: number }];
    expect(count).toBeGreaterThan(0);
  });

  it('refuses a state-changing request without the CSRF token', async () => {
    const { agent, csrf } = await signIn(app, 'admin@demo.ratewarden.test');
    const body = { clientId: 'csrf-probe', name: 'probe' };
    const refused = await agent.post('/api/admin/clients').send(body).expect(403);
    expect(refused.body.details).toEqual({ reason: 'csrf' });
    await agent.post('/api/admin/clients').set('x-csrf-token', 'wrong-token-wrong-token-wrong-t').send(body).expect(403);
    await agent.post('/api/admin/clients').set('x-csrf-token', csrf).send(body).expect(201);
  });

  it("signs out at both ends: the session ends and the browser goes to the provider's end-session page", async () => {
    const { agent, csrf } = await signIn(app, 'admin@demo.ratewarden.test');
    const out = await agent.post('/auth/logout').set('x-csrf-token', csrf).expect(303);
    const target = new URL(out.headers.location as string);
    expect(target.origin).toBe(inject('auth').issuer);
    expect(target.pathname).toBe('/session/end');
    expect(target.searchParams.get('id_token_hint')).toBeTruthy();
    const after = await agent.get('/api/session').expect(200);
    expect(after.body.user).toBeNull();
    await agent.get('/api/admin/users').expect(401);
  });
});

describe('integration client tokens', () => {
  let ds: DataSource;
  let app: ReturnType<typeof createApp>;
  const { issuer } = inject('auth');

  beforeAll(async () => {
    ds = await openTestDataSource();
    await ds.query(
      `INSERT INTO integration_clients (client_id, name) VALUES ('hr-sync-demo', 'HR sync') ON CONFLICT (client_id) DO UPDATE SET revoked_at = NULL`,
    );
    app = createApp({ dataSource: ds, config: testApiConfig() });
  });
  afterAll(async () => {
    vi.useRealTimers();
    await ds.destroy();
  });

  it('reaches nothing but intake: other routes answer 403', async () => {
    const token = await clientToken(issuer);
    for (const path of ['/api/admin/users', '/api/admin/audit', '/api/admin/clients']) {
      await request(app).get(path).set('authorization', `Bearer ${token}`).expect(403);
    }
  });

  it('refuses a token signed by another key (401)', async () => {
    const { privateKey } = await generateKeyPair('RS256');
    const forged = await new SignJWT({ client_id: 'hr-sync-demo', scope: 'intake:write' })
      .setProtectedHeader({ alg: 'RS256', kid: 'forged' })
      .setIssuer(issuer)
      .setAudience('urn:ratewarden:api')
      .setIssuedAt()
      .setExpirationTime('5m')
      .sign(privateKey);
    const res = await request(app).get('/api/admin/users').set('authorization', `Bearer ${forged}`).expect(401);
    expect(res.body.code).toBe('unauthenticated');
  });

  it('refuses a token for another audience (401)', async () => {
    const token = await clientToken(issuer);
    const other = createApp({ dataSource: ds, config: testApiConfig({ OIDC_API_AUDIENCE: 'urn:someone-else' }) });
    const res = await request(other).get('/api/admin/users').set('authorization', `Bearer ${token}`).expect(401);
    expect(res.body.message).toMatch(/aud/);
  });

  it('refuses an expired token (401)', async () => {
    const token = await clientToken(issuer);
    vi.useFakeTimers({ toFake: ['Date'] });
    vi.setSystemTime(Date.now() + 2 * 3600_000);
    const res = await request(app).get('/api/admin/users').set('authorization', `Bearer ${token}`).expect(401);
    vi.useRealTimers();
    expect(res.body.message).toMatch(/expired/);
  });

  it('refuses a revoked client (403) even with a valid token', async () => {
    const token = await clientToken(issuer);
    await ds.query(`UPDATE integration_clients SET revoked_at = now() WHERE client_id = 'hr-sync-demo'`);
    const res = await request(app).get('/api/admin/users').set('authorization', `Bearer ${token}`).expect(403);
    expect(res.body.message).toMatch(/revoked/);
    await ds.query(`UPDATE integration_clients SET revoked_at = NULL WHERE client_id = 'hr-sync-demo'`);
  });
});

import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createApp } from '@ratewarden/api/app';
import { provisionUser, signIn } from '../support/sign-in';
import { testApiConfig } from '../support/test-config';
import { allSiteIds, openTestDataSource } from '../support/test-db';

/**
 * Sessions and people are kept in each API process's memory under the `access` counter of
 * data_versions. Two apps stand for two API processes: a sign-out or a role removed through one
 * (or straight in the database) is refused by the other from its very next request, though the
 * other had the session and the person in memory.
 */
describe('sessions and people kept in memory', () => {
  let ds: DataSource;
  let one: ReturnType<typeof createApp>;
  let other: ReturnType<typeof createApp>;
  const email = 'newcomer@demo.ratewarden.test';
  let siteId: number;

  const cookieOf = async (agent: ReturnType<typeof request.agent>) => {
    const res = await agent.get('/api/session').expect(200);
    return (res.headers['set-cookie'] as unknown as string[]).find((c) => c.startsWith('rw.sid='))!.split(';')[0]!;
  };
  /** Two reads through the other process, so its memory holds the session and the person. */
  const readTwice = async (cookie: string, status: number) => {
    for (let i = 0; i < 2; i++) await request(other).get('/api/periods').set('cookie', cookie).expect(status);
  };

  beforeAll(async () => {
    ds = await openTestDataSource();
    one = createApp({ dataSource: ds, config: testApiConfig() });
    other = createApp({ dataSource: ds, config: testApiConfig() });
    const [site] = (await ds.query(`INSERT INTO sites (code, name) VALUES ($1, 'Session cache test site') RETURNING id`, [`SC${Date.now() % 1e6}`])) as Array<{
      id: number;
    }>;
    siteId = site!.id;
  });
  afterAll(async () => {
    await provisionUser(ds, email, null);
    await ds?.destroy();
  });

  it('refuses a session signed out through another process at once', async () => {
    await provisionUser(ds, email, 'hygienist', await allSiteIds(ds));
    const person = await signIn(one, email);
    const cookie = await cookieOf(person.agent);
    await readTwice(cookie, 200);
    await person.agent.post('/auth/logout').set('x-csrf-token', person.csrf).expect(303);
    await request(other).get('/api/periods').set('cookie', cookie).expect(401);
    expect((await request(other).get('/api/session').set('cookie', cookie).expect(200)).body.user).toBeNull();
  });

  it('applies a role removed or changed elsewhere at the next request', async () => {
    await provisionUser(ds, email, 'hygienist', await allSiteIds(ds));
    const person = await signIn(one, email);
    const cookie = await cookieOf(person.agent);
    await readTwice(cookie, 200);
    // As an administrator's change through another process, or a script, writes it.
    await provisionUser(ds, email, null);
    await request(other).get('/api/periods').set('cookie', cookie).expect(403);
    await provisionUser(ds, email, 'safety_manager', [siteId]);
    const session = await request(other).get('/api/session').set('cookie', cookie).expect(200);
    expect(session.body.user).toMatchObject({ role: 'safety_manager', siteIds: [siteId] });
    await person.agent.post('/auth/logout').set('x-csrf-token', person.csrf).expect(303);
  });

  it('keeps a session read from memory alive across requests, and its CSRF token valid', async () => {
    await provisionUser(ds, email, 'hygienist', await allSiteIds(ds));
    const person = await signIn(one, email);
    for (let i = 0; i < 3; i++) await person.agent.get('/api/periods').expect(200);
    // A write still needs the session's token, read from memory like the rest of the session.
    await person.agent.post('/api/periods/close').send({}).expect(403);
    await person.agent.post('/api/periods/close').set('x-csrf-token', person.csrf).send({}).expect(422);
  });
});

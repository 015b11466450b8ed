import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { openTestDataSource } from '../support/test-db';
import { writeFixture, type WriteFixture } from './patch-fixture';

/**
 * Every write body refuses keys it does not know (a misspelt field, or one the route must not let
 * anyone set, such as isReference or code), with 422 naming the key, and changes nothing.
 */
describe('unknown keys in write bodies', () => {
  let ds: DataSource;
  let f: WriteFixture;

  beforeAll(async () => {
    ds = await openTestDataSource();
    f = await writeFixture(ds);
  });
  afterAll(async () => {
    await ds.destroy();
  });

  const cases: Array<{
    name: string;
    who: 'admin' | 'hygienist' | 'safety';
    method: 'post' | 'patch' | 'put';
    path: (f: WriteFixture) => string;
    body: (f: WriteFixture) => object;
    key: string;
  }> = [
    {
      name: 'inviting a person',
      who: 'admin',
      method: 'post',
      path: () => '/api/admin/users',
      body: (f) => ({ email: `new-${f.tag.toLowerCase()}@kestrelmoor.test`, name: 'New', role: 'hygienist', siteIds: [], isAdmin: true }),
      key: 'isAdmin',
    },
    {
      name: "changing a person's access",
      who: 'admin',
      method: 'patch',
      path: (f) => `/api/admin/users/${f.personId}`,
      body: () => ({ role: 'physician', siteIds: [], password: 'x' }),
      key: 'password',
    },
    {
      name: 'registering a client',
      who: 'admin',
      method: 'post',
      path: () => '/api/admin/clients',
      body: (f) => ({ clientId: `c-${f.tag}`, name: 'HR', secret: 'x' }),
      key: 'secret',
    },
    {
      name: 'creating a watch rule',
      who: 'safety',
      method: 'post',
      path: () => '/api/rules',
      body: (f) => ({ name: 'x', outcomeId: f.outcomeId, measure: 'irr', threshold: 1, owner: 'me' }),
      key: 'owner',
    },
    {
      name: 'changing a watch rule',
      who: 'safety',
      method: 'patch',
      path: (f) => `/api/rules/${f.ruleId}`,
      body: () => ({ name: 'renamed', minCase: 9 }),
      key: 'minCase',
    },
    {
      name: 'creating an exposure group',
      who: 'hygienist',
      method: 'post',
      path: () => '/api/groups',
      body: (f) => ({ code: `X${f.tag}`, name: 'x', hazard: 'x', exposureLevel: 1, isReference: true }),
      key: 'isReference',
    },
    {
      name: 'changing an exposure group',
      who: 'hygienist',
      method: 'patch',
      path: (f) => `/api/groups/${f.groupId}`,
      body: () => ({ name: 'renamed', code: 'OTHER' }),
      key: 'code',
    },
    {
      name: 'setting exposure levels',
      who: 'hygienist',
      method: 'put',
      path: () => '/api/groups/levels',
      body: (f) => ({ levels: [{ id: f.groupId, exposureLevel: 3, name: 'x' }] }),
      key: 'levels.0.name',
    },
    {
      name: 'creating an outcome',
      who: 'hygienist',
      method: 'post',
      path: () => '/api/outcomes',
      body: (f) => ({ code: `Y${f.tag}`, name: 'y', caseDefinition: 'y', countingRule: 'recurrent', lag: 2 }),
      key: 'lag',
    },
    {
      name: 'changing an outcome',
      who: 'hygienist',
      method: 'patch',
      path: (f) => `/api/outcomes/${f.outcomeId}`,
      body: () => ({ name: 'renamed', updatedAt: '2030-01-01T00:00:00Z' }),
      key: 'updatedAt',
    },
    {
      name: 'starting a flag review',
      who: 'safety',
      method: 'post',
      path: () => `/api/flags/${randomUUID()}/review`,
      body: () => ({ comment: 'x', state: 'closed' }),
      key: 'state',
    },
    {
      name: 'closing a flag',
      who: 'safety',
      method: 'post',
      path: () => `/api/flags/${randomUUID()}/close`,
      body: () => ({ reason: 'explained', comment: 'x', closedBy: 'x' }),
      key: 'closedBy',
    },
  ];

  it.each(cases)('$name: 422 naming "$key"', async ({ who, method, path, body, key }) => {
    const res = await f.write(f.as[who], method, path(f), body(f));
    expect(res.status).toBe(422);
    const field = key.split('.').at(-1)!;
    expect(res.body).toMatchObject({ code: 'validation_failed', message: expect.stringContaining(`"${field}"`) });
    expect(res.body.details).toEqual([{ path: key, message: `unknown field "${field}"` }]);
  });

  it('changes nothing when it refuses', async () => {
    expect(await f.audits(`user:${f.personId}`)).toBe(0);
    expect(await f.audits(`watch_rule:${f.ruleId}`)).toBe(1); // its creation
    expect(await f.audits(`exposure_group:${f.groupId}`)).toBe(1);
    expect(await f.audits(`outcome:${f.outcomeId}`)).toBe(1);
    const made = (await ds.query(
      `SELECT (SELECT count(*) FROM exposure_groups WHERE code = $1)::int + (SELECT count(*) FROM outcomes WHERE code = $2)::int
      + (SELECT count(*) FROM integration_clients WHERE client_id = $3)::int AS n`,
      [`X${f.tag}`, `Y${f.tag}`, `c-${f.tag}`],
    )) as Array<{ n: number }>;
    expect(made[0]!.n).toBe(0);
  });
});

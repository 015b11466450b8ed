import request from 'supertest';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { createApp } from '@ratewarden/api/app';
import { listRoutes, type RouteEntry } from '@ratewarden/api/lib/route-table';
import type { Role } from '@ratewarden/shared/domain';
import { clientPermissions, roleMay } from '@ratewarden/shared/permissions';
import type { DataSource } from 'typeorm';
import { clientToken, provisionUser, signIn, type SignedInAgent } from '../support/sign-in';
import { testApiConfig } from '../support/test-config';
import { openTestDataSource } from '../support/test-db';

/** Routes anyone may call: the health probe and the session probe (which says "nobody" when signed out). */
const PUBLIC = new Set(['GET /api/health', 'GET /api/session']);

const accounts: Record<Role, string> = {
  hygienist: 'hygienist@demo.ratewarden.test',
  safety_manager: 'safety@demo.ratewarden.test',
  physician: 'physician@demo.ratewarden.test',
  administrator: 'admin@demo.ratewarden.test',
};
const roles = Object.keys(accounts) as Role[];

/** Fills path parameters with values that parse but match nothing. */
const concrete = (path: string) =>
  path.replace(/:(\w*id\w*|\w+)/gi, (_m, name: string) => (/id$/i.test(name) && !/clientId/i.test(name) ? '00000000-0000-4000-8000-000000000000' : 'probe'));

function send(agent: ReturnType<typeof request.agent> | ReturnType<typeof request>, route: RouteEntry, path = concrete(route.path)) {
  const method = route.method.toLowerCase() as 'get' | 'post' | 'patch' | 'put' | 'delete';
  return agent[method](path);
}

/** A case-level record whose identifiers must never reach anyone but the physician. */
const PLANTED = { workerKey: 'W-PLANTED-7731', caseRef: 'CASE-PLANTED-7731' };

async function plantCase(ds: DataSource): Promise<void> {
  await ds.query(`INSERT INTO sites (code, name) VALUES ('PLANT', 'Planted site') ON CONFLICT DO NOTHING`);
  await ds.query(`INSERT INTO exposure_groups (code, name, hazard) VALUES ('PLANT', 'Planted group', 'noise') ON CONFLICT DO NOTHING`);
  await ds.query(
    `INSERT INTO outcomes (code, name, case_definition, counting_rule) VALUES ('PLANT', 'Planted outcome', 'test', 'recurrent') ON CONFLICT DO NOTHING`,
  );
  const [intake] = (await ds.query(
    `INSERT INTO intakes (kind, state, file_name, checksum, size_bytes, submitted_by_client) VALUES ('cases', 'applied', 'planted.csv', repeat('a', 64), 0, 'test') RETURNING id`,
  )) as { id: string }[];
  const [worker] = (await ds.query(
    `INSERT INTO workers (worker_key, birth_year, sex) VALUES ($1, 1980, 'F') ON CONFLICT (worker_key) DO UPDATE SET sex = 'F' RETURNING id`,
    [PLANTED.workerKey],
  )) as { id: string }[];
  await ds.query(
    `INSERT INTO case_events (intake_id, case_ref, worker_id, outcome_id, onset_date, status)
     SELECT $1, $2, $3, id, '2024-03-05', 'confirmed' FROM outcomes WHERE code = 'PLANT'
     ON CONFLICT DO NOTHING`,
    [intake!.id, PLANTED.caseRef, worker!.id],
  );
}

describe('the route × role table, walked on the real app', () => {
  let ds: DataSource;
  let app: ReturnType<typeof createApp>;
  let routes: RouteEntry[];
  const agents = {} as Record<Role, SignedInAgent>;

  beforeAll(async () => {
    ds = await openTestDataSource();
    await ds.query(
      `INSERT INTO integration_clients (client_id, name) VALUES ('hr-sync-demo', 'HR sync') ON CONFLICT (client_id) DO UPDATE SET revoked_at = NULL`,
    );
    await plantCase(ds);
    app = createApp({ dataSource: ds, config: testApiConfig() });
    routes = listRoutes(app).filter((r) => r.path.startsWith('/api/') && !PUBLIC.has(`${r.method} ${r.path}`));
    for (const role of roles) {
      await provisionUser(ds, accounts[role], role);
      agents[role] = await signIn(app, accounts[role]);
    }
  });
  afterAll(async () => {
    await ds.destroy();
  });

  it('finds the API routes, and every one of them has a guard', () => {
    expect(routes.length).toBeGreaterThan(5);
    expect(routes.filter((r) => r.permission === null).map((r) => `${r.method} ${r.path}`)).toEqual([]);
  });

  it("guards the physician's workspace and the notices inbox with the permissions they need", () => {
    const guard = (method: string, path: string) => routes.find((r) => r.method === method && r.path === path)?.permission;
    expect({
      register: guard('GET', '/api/cases'),
      export: guard('GET', '/api/cases/export'),
      case: guard('GET', '/api/cases/:caseRef'),
      review: guard('POST', '/api/cases/:caseRef/review'),
      conflicts: guard('GET', '/api/cases/conflicts/:intakeId'),
      resolve: guard('POST', '/api/cases/conflicts/:intakeId/:caseRef'),
      notes: guard('GET', '/api/flags/:id/notes'),
      addNote: guard('POST', '/api/flags/:id/notes'),
      inbox: guard('GET', '/api/notices'),
      unread: guard('GET', '/api/notices/unread'),
      open: guard('POST', '/api/notices/:id/open'),
      markUnread: guard('POST', '/api/notices/:id/unread'),
    }).toEqual({
      register: 'cases:read',
      export: 'cases:read',
      case: 'cases:read',
      review: 'cases:review',
      conflicts: 'cases:read',
      resolve: 'cases:review',
      notes: 'cases:read',
      addNote: 'cases:review',
      inbox: 'flags:read',
      unread: 'flags:read',
      open: 'flags:read',
      markUnread: 'flags:read',
    });
  });

  it('answers 401 to everyone not signed in, on every route', async () => {
    for (const route of routes) {
      const res = await send(request(app), route);
      expect(res.status, `${route.method} ${route.path}`).toBe(401);
    }
  });

  it('answers 403 to a role without the permission and lets a role with it through', async () => {
    for (const route of routes) {
      for (const role of roles) {
        const res = await send(agents[role].agent, route).set('x-csrf-token', agents[role].csrf).send({});
        const label = `${role} ${route.method} ${route.path} -> ${res.status} ${JSON.stringify(res.body).slice(0, 120)}`;
        if (roleMay(role, route.permission!)) {
          expect([401, 403], label).not.toContain(res.status);
          expect(res.status, label).toBeLessThan(500);
          // A list without parameters answers 2xx (a singleton such as the current run may be 404 while empty; a route needing a query, 422).
          if (route.method === 'GET' && !route.path.includes(':')) expect([200, 204, 404, 422], label).toContain(res.status);
        } else {
          expect(res.status, label).toBe(403);
          expect(res.body.code, label).toBe('forbidden');
        }
      }
    }
  });

  it('gives a signed-in person with no role 403 everywhere', async () => {
    await provisionUser(ds, 'newcomer@demo.ratewarden.test', null);
    const { agent, csrf } = await signIn(app, 'newcomer@demo.ratewarden.test');
    for (const route of routes) {
      const res = await send(agent, route).set('x-csrf-token', csrf).send({});
      expect(res.status, `${route.method} ${route.path}`).toBe(403);
    }
  });

  it('lets an integration client token reach the intake routes it may use, and nothing else', async () => {
    const token = await clientToken(inject('auth').issuer);
    for (const route of routes) {
      const res = await send(request(app), route).set('authorization', `Bearer ${token}`).send({});
      const label = `client ${route.method} ${route.path} -> ${res.status}`;
      if (clientPermissions.includes(route.permission!)) expect([401, 403], label).not.toContain(res.status);
      else expect(res.status, label).toBe(403);
    }
  });

  it('keeps case-level routes for the physician alone, whatever the query string asks', async () => {
    const caseRoutes = routes.filter((r) => r.permission?.startsWith('cases:'));
    for (const role of roles.filter((r) => r !== 'physician')) {
      for (const route of caseRoutes) {
        for (const query of ['', '?format=csv', '?export=1&include=cases', '?role=physician']) {
          const res = await send(agents[role].agent, route, concrete(route.path) + query)
            .set('x-csrf-token', agents[role].csrf)
            .send({});
          expect(res.status, `${role} ${route.method} ${route.path}${query}`).toBe(403);
        }
      }
    }
  });

  it('never puts case-level fields into what other roles can read, even when asked to', async () => {
    for (const role of roles.filter((r) => r !== 'physician')) {
      for (const route of routes.filter((r) => r.method === 'GET' && roleMay(role, r.permission!))) {
        const res = await send(agents[role].agent, route, `${concrete(route.path)}?include=cases&fields=caseRef,workerKey&format=csv`);
        expect(res.text, `${role} GET ${route.path}`).not.toMatch(/"(caseRef|case_ref|workerKey|worker_key|onsetDate|onset_date)"\s*:/);
        expect(res.text, `${role} GET ${route.path}`).not.toContain(PLANTED.workerKey);
        expect(res.text, `${role} GET ${route.path}`).not.toContain(PLANTED.caseRef);
      }
    }
  });
});

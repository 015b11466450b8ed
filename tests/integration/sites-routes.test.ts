import { randomBytes } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createApp } from '@ratewarden/api/app';
import { readSitePeriods } from '@ratewarden/db/reporting-periods';
import { siteSchema } from '@ratewarden/shared/groups';
import { PeriodBook } from '@ratewarden/shared/periods';
import { provisionUser, signIn, type SignedInAgent } from '../support/sign-in';
import { testApiConfig } from '../support/test-config';
import { openTestDataSource } from '../support/test-db';

/** Sites managed by the administrator: create, rename, retire (history kept), reinstate. */
describe('site routes', () => {
  let ds: DataSource;
  let as: Record<'hygienist' | 'admin', SignedInAgent>;
  const tag = randomBytes(3).toString('hex').toUpperCase();
  const write = (who: SignedInAgent, method: 'post' | 'patch', path: string, body: object = {}) =>
    who.agent[method](path).set('x-csrf-token', who.csrf).send(body);

  beforeAll(async () => {
    ds = await openTestDataSource();
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist');
    await provisionUser(ds, 'admin@demo.ratewarden.test', 'administrator');
    const app = createApp({ dataSource: ds, config: testApiConfig() });
    as = { hygienist: await signIn(app, 'hygienist@demo.ratewarden.test'), admin: await signIn(app, 'admin@demo.ratewarden.test') };
  });
  afterAll(async () => {
    await ds?.destroy();
  });

  it('lets the administrator create a site (code upper-cased), once; nobody else', async () => {
    await write(as.hygienist, 'post', '/api/sites', { code: `N${tag}`, name: 'North yard' }).expect(403);
    const s = siteSchema.parse((await write(as.admin, 'post', '/api/sites', { code: ` n${tag} `, name: 'North yard', region: 'North' }).expect(201)).body);
    expect(s).toMatchObject({ code: `N${tag}`, name: 'North yard', region: 'North', retiredAt: null });
    await write(as.admin, 'post', '/api/sites', { code: `N${tag}`, name: 'Again' }).expect(409);
    await write(as.admin, 'post', '/api/sites', { code: 'no spaces', name: 'x' }).expect(422);
    const list = ((await as.hygienist.agent.get('/api/sites').expect(200)).body as unknown[]).map((x) => siteSchema.parse(x));
    expect(list.map((x) => x.code)).toContain(`N${tag}`);
  });

  it('renames a site (the code stays) and audits the change', async () => {
    const s = siteSchema.parse((await write(as.admin, 'post', '/api/sites', { code: `R${tag}`, name: 'Old name' }).expect(201)).body);
    const renamed = siteSchema.parse((await write(as.admin, 'patch', `/api/sites/${s.id}`, { name: 'New name' }).expect(200)).body);
    expect(renamed).toMatchObject({ code: `R${tag}`, name: 'New name' });
    await write(as.admin, 'patch', `/api/sites/${s.id}`, { code: 'OTHER' }).expect(422);
    const audit = (await ds.query(`SELECT action, detail FROM audit_events WHERE target = $1 ORDER BY id`, [`site:${s.id}`])) as Array<{
      action: string;
      detail: { before: { name: string } | null; after: { name: string } };
    }>;
    expect(audit.map((a) => a.action)).toEqual(['site.create', 'site.rename']);
    expect(audit[1]!.detail).toMatchObject({ before: { name: 'Old name' }, after: { name: 'New name' } });
  });

  it('retires a site: its months stay, it is not expected after its retirement, and a run is requested', async () => {
    const s = siteSchema.parse((await write(as.admin, 'post', '/api/sites', { code: `T${tag}`, name: 'To retire' }).expect(201)).body);
    const [intake] = (await ds.query(
      `INSERT INTO intakes (kind, state, file_name, checksum, size_bytes, site_ids, submitted_by_client, applied_at) VALUES ('roster', 'applied', 'r.csv', $1, 1, $2, 'site-tests', now()) RETURNING id`,
      [randomBytes(32).toString('hex'), [s.id]],
    )) as Array<{ id: string }>;
    // Rostered in the month before this one: expected in this month and the next eleven.
    const [{ month }] = (await ds.query(`SELECT to_char(date_trunc('month', now()) - interval '1 month', 'YYYY-MM-DD') AS month`)) as [{ month: string }];
    await ds.query(`INSERT INTO roster_slices (intake_id, site_id, month) VALUES ($1, $2, $3)`, [intake!.id, s.id, month]);
    const later = (await ds.query(`SELECT to_char(date_trunc('month', now()) + interval '1 month', 'YYYY-MM-DD') AS m`)) as Array<{ m: string }>;
    const expectedLater = async () => new PeriodBook(await readSitePeriods(ds, { siteIds: [s.id], through: later[0]!.m })).expectedSites(later[0]!.m);
    expect(await expectedLater()).toEqual([s.id]);

    const pendingBefore = Number(((await ds.query(`SELECT count(*) AS n FROM run_requests WHERE picked_at IS NULL`)) as Array<{ n: string }>)[0]!.n);
    await write(as.hygienist, 'post', `/api/sites/${s.id}/retire`).expect(403);
    const retired = siteSchema.parse((await write(as.admin, 'post', `/api/sites/${s.id}/retire`).expect(200)).body);
    expect(retired.retiredAt).not.toBeNull();
    expect(Number(((await ds.query(`SELECT count(*) AS n FROM run_requests WHERE picked_at IS NULL`)) as Array<{ n: string }>)[0]!.n)).toBe(pendingBefore + 1);
    expect(await expectedLater()).toEqual([]);
    // The rostered month is history: still there, still the site's.
    const periods = await readSitePeriods(ds, { siteIds: [s.id], through: later[0]!.m });
    expect(periods.find((p) => p.month === month)).toMatchObject({ roster: true, retired: false });
    const list = ((await as.hygienist.agent.get('/api/sites').expect(200)).body as unknown[]).map((x) => siteSchema.parse(x));
    expect(list.find((x) => x.id === s.id)?.retiredAt).not.toBeNull();

    const back = siteSchema.parse((await write(as.admin, 'post', `/api/sites/${s.id}/reinstate`).expect(200)).body);
    expect(back.retiredAt).toBeNull();
    expect(await expectedLater()).toEqual([s.id]);
    await ds.query(`DELETE FROM roster_slices WHERE intake_id = $1`, [intake!.id]);
  });
});

import { parse } from 'csv-parse/sync';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createApp } from '@ratewarden/api/app';
import { templateCsv } from '@ratewarden/shared/intake-columns';
import { intakeDetailSchema, intakeListResponseSchema, intakeUploadResponseSchema, rowSchema } from '@ratewarden/shared/intake-schemas';
import { clientToken, provisionUser, signIn, type SignedInAgent } from '../support/sign-in';
import { testApiConfig } from '../support/test-config';
import { openTestDataSource } from '../support/test-db';
import { currentRoster, makeCorner, type Corner } from './intake-support';

const roster = (rows: string[]) => `worker_key,site,exposure_group,month,hours,birth_year,sex\n${rows.join('\n')}\n`;

/**
 * The intake routes with a signed-in hygienist and with the HR integration client's bearer token:
 * multipart upload (check, then apply), list, detail, discard, restore, site scoping, templates.
 */
describe('intake routes through the API', () => {
  let ds: DataSource;
  let c: Corner;
  let app: ReturnType<typeof createApp>;
  let hyg: SignedInAgent;
  let narrow: SignedInAgent;
  let token: string;

  const upload = (who: SignedInAgent, query: string, body: string, fileName = 'roster.csv') =>
    who.agent
      .post(`/api/intakes?${query}`)
      .set('x-csrf-token', who.csrf)
      .attach('file', Buffer.from(c.fill(body)), { filename: fileName, contentType: 'text/csv' });
  const post = (who: SignedInAgent, path: string) => who.agent.post(path).set('x-csrf-token', who.csrf);

  beforeAll(async () => {
    ds = await openTestDataSource();
    c = await makeCorner(ds);
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', c.siteIds);
    // A second hygienist who may see only the corner's first site.
    await provisionUser(ds, 'newcomer@demo.ratewarden.test', 'hygienist', [c.siteIds[0]!]);
    await ds.query(`INSERT INTO integration_clients (client_id, name) VALUES ('hr-sync-demo', 'HR') ON CONFLICT DO NOTHING`);
    app = createApp({ dataSource: ds, config: testApiConfig() });
    hyg = await signIn(app, 'hygienist@demo.ratewarden.test');
    narrow = await signIn(app, 'newcomer@demo.ratewarden.test');
    token = await clientToken(inject('auth').issuer);
  });
  afterAll(async () => {
    await provisionUser(ds, 'newcomer@demo.ratewarden.test', null);
    await ds?.destroy();
  });

  it('uploads check-only, shows it in the list and in detail, then applies it', async () => {
    const res = await upload(hyg, 'kind=roster&mode=check', roster(['{W}1,{S1},{GA},2025-01,160,1980,F', '{W}2,{S1},{GB},2025-01,151.25,1975,M'])).expect(201);
    const { intake, duplicate } = intakeUploadResponseSchema.parse(res.body);
    expect(duplicate).toBe(false);
    expect(intake).toMatchObject({
      state: 'checked',
      rowCount: 2,
      problemCount: 0,
      fileName: 'roster.csv',
      siteIds: [c.siteIds[0]],
      monthFrom: '2025-01',
      monthTo: '2025-01',
      staged: true,
      submittedBy: 'hygienist@demo.ratewarden.test',
    });
    // Hours by hand: 160 + 151.25.
    expect(intake.diff).toMatchObject({ kind: 'roster', newWorkers: 2, totals: { added: 2, newSlices: 1 }, slices: [{ month: '2025-01', newHours: 311.25 }] });
    expect(await currentRoster(ds, c.siteIds)).toEqual([]);

    const list = intakeListResponseSchema.parse((await hyg.agent.get('/api/intakes?kind=roster&state=checked').expect(200)).body);
    expect(list.items.map((i) => i.id)).toContain(intake.id);
    const detail = intakeDetailSchema.parse((await hyg.agent.get(`/api/intakes/${intake.id}`).expect(200)).body);
    expect(detail).toMatchObject({ id: intake.id, state: 'checked', problems: [], runRequest: null });

    const applied = intakeDetailSchema.parse((await post(hyg, `/api/intakes/${intake.id}/apply`).expect(200)).body);
    expect(applied).toMatchObject({ state: 'applied', staged: false, runRequest: { reason: 'roster intake applied' } });
    expect((await currentRoster(ds, c.siteIds)).map((r) => [r.worker_key, r.hours])).toEqual([
      [`${c.codes.W}1`, '160.00'],
      [`${c.codes.W}2`, '151.25'],
    ]);
    // Applying twice is refused: it is no longer checked.
    await post(hyg, `/api/intakes/${intake.id}/apply`).expect(409);
  });

  it('answers a file with problems with 422 and the problems per line and column', async () => {
    const res = await upload(hyg, 'kind=roster&mode=check', roster(['{W}3,{S1},{GA},2025-13,160,1980,F', '{W}4,{S1},{GA},2025-02,800,1980,F'])).expect(422);
    expect(res.body.details.intake).toMatchObject({ state: 'rejected', problemCount: 2 });
    expect(res.body.details.intake.problems.map((p: { line: number; column: string }) => [p.line, p.column])).toEqual([
      [2, 'month'],
      [3, 'hours'],
    ]);
  });

  it('discards a checked intake', async () => {
    const { body } = await upload(hyg, 'kind=roster&mode=check', roster(['{W}5,{S2},{GA},2025-03,100,1970,M'])).expect(201);
    const discarded = intakeDetailSchema.parse((await post(hyg, `/api/intakes/${body.intake.id}/discard`).expect(200)).body);
    expect(discarded).toMatchObject({ state: 'rejected', staged: false });
    await post(hyg, `/api/intakes/${body.intake.id}/apply`).expect(409);
    expect(await ds.query(`SELECT count(*)::int AS n FROM roster_entries WHERE intake_id = $1`, [body.intake.id])).toEqual([{ n: 0 }]);
  });

  it('supersedes a site × month by a new version and restores the earlier one', async () => {
    const v1 = (await upload(hyg, 'kind=roster&mode=apply', roster(['{W}6,{S2},{GA},2025-04,100,1970,M'])).expect(201)).body.intake;
    expect(v1.state).toBe('applied');
    const v2 = (await upload(hyg, 'kind=roster&mode=apply', roster(['{W}6,{S2},{GA},2025-04,120,1970,M'])).expect(201)).body.intake;
    expect(v2.diff.totals).toMatchObject({ hoursChanged: 1, replacedSlices: 1 });
    expect((await hyg.agent.get(`/api/intakes/${v1.id}`).expect(200)).body.state).toBe('superseded');
    const restored = intakeDetailSchema.parse((await post(hyg, `/api/intakes/${v1.id}/restore`).expect(200)).body);
    expect(restored.state).toBe('applied');
    expect((await hyg.agent.get(`/api/intakes/${v2.id}`).expect(200)).body.state).toBe('superseded');
    const month = (await currentRoster(ds, c.siteIds)).filter((r) => r.month === '2025-04');
    expect(month.map((r) => r.hours)).toEqual(['100.00']);
  });

  it('refuses a hygienist a file with rows of a site outside their sites, storing nothing', async () => {
    const res = await upload(
      narrow,
      'kind=roster&mode=apply',
      roster(['{W}7,{S1},{GA},2025-05,100,1970,M', '{W}8,{S2},{GA},2025-05,100,1970,M']),
      'other-site.csv',
    ).expect(403);
    expect(res.body.error?.code ?? res.body.code).toBe('forbidden');
    expect(await ds.query(`SELECT count(*)::int AS n FROM intakes WHERE file_name = 'other-site.csv'`)).toEqual([{ n: 0 }]);
    expect(await ds.query(`SELECT count(*)::int AS n FROM workers WHERE worker_key = ANY($1)`, [[`${c.codes.W}7`, `${c.codes.W}8`]])).toEqual([{ n: 0 }]);
    // Their own site alone is fine; intakes of the other site stay out of their list and detail.
    await upload(narrow, 'kind=roster&mode=check', roster(['{W}7,{S1},{GA},2025-05,100,1970,M']), 'own-site.csv').expect(201);
    const mine = intakeListResponseSchema.parse((await narrow.agent.get('/api/intakes?kind=roster').expect(200)).body);
    expect(mine.items.every((i) => i.siteIds.every((s) => s === c.siteIds[0]))).toBe(true);
    const other = (await ds.query(`SELECT id FROM intakes WHERE site_ids = $1 LIMIT 1`, [[c.siteIds[1]]])) as Array<{ id: string }>;
    await narrow.agent.get(`/api/intakes/${other[0]!.id}`).expect(403);
  });

  it('lets the integration client check, and check-and-apply, with its bearer token', async () => {
    const bearer = (path: string) => request(app).post(path).set('authorization', `Bearer ${token}`);
    const checked = await bearer('/api/intakes?kind=roster&mode=check')
      .attach('file', Buffer.from(c.fill(roster(['{W}9,{S1},{GC},2025-06,80.5,1990,X']))), 'hr-export.csv')
      .expect(201);
    expect(checked.body.intake).toMatchObject({ state: 'checked', submittedBy: 'client:hr-sync-demo' });
    const applied = await bearer('/api/intakes?kind=roster&mode=apply')
      .attach('file', Buffer.from(c.fill(roster(['{W}10,{S1},{GC},2025-07,90,1991,F']))), 'hr-export-2.csv')
      .expect(201);
    expect(applied.body.intake).toMatchObject({ state: 'applied', runRequest: { reason: 'roster intake applied' } });
    expect((await currentRoster(ds, c.siteIds)).filter((r) => r.month === '2025-07').map((r) => r.worker_key)).toEqual([`${c.codes.W}10`]);
  });

  it('refuses the integration client everywhere but the intake upload', async () => {
    const auth = { authorization: `Bearer ${token}` };
    await request(app).get('/api/intakes').set(auth).expect(403);
    const id = ((await ds.query(`SELECT id FROM intakes ORDER BY created_at DESC LIMIT 1`)) as Array<{ id: string }>)[0]!.id;
    await request(app).get(`/api/intakes/${id}`).set(auth).expect(403);
    await request(app).get('/api/groups').set(auth).expect(403);
    await request(app).post('/api/groups').set(auth).send({ code: 'NOPE', name: 'x', hazard: 'x', exposureLevel: 1 }).expect(403);
    await request(app).get('/api/runs').set(auth).expect(403);
    // A wrong token is not a token.
    await request(app)
      .post('/api/intakes?kind=roster&mode=check')
      .set('authorization', 'Bearer not-a-token')
      .attach('file', Buffer.from('worker_key\n'), 'x.csv')
      .expect(401);
  });

  it('serves the templates: the header and an example row that passes the row schema', async () => {
    for (const kind of ['roster', 'cases'] as const) {
      const res = await hyg.agent.get(`/api/intakes/templates/${kind}.csv`).expect(200);
      expect(res.headers['content-type']).toMatch(/^text\/csv/);
      expect(res.headers['content-disposition']).toMatch(new RegExp(`^attachment; filename="?ratewarden-${kind}-template\\.csv"?$`));
      expect(res.text).toBe(templateCsv(kind));
      const rows = parse(res.text, { columns: true }) as Array<Record<string, string>>;
      expect(rows).toHaveLength(1);
      expect(rowSchema(kind).safeParse(rows[0]).success).toBe(true);
    }
    await hyg.agent.get('/api/intakes/templates/other.csv').expect(404);
  });

  // Last: its roster stays in the corner's first site.
  it("refreshes the roster tables' missing planner statistics before checking a case list (after a large roster the check otherwise takes a bad plan)", async () => {
    await upload(hyg, 'kind=roster&mode=apply', roster(['{W}90,{S1},{GA},2025-04,160,1980,F'])).expect(201);
    await ds.query(`SELECT pg_stat_reset_single_table_counters('roster_entries'::regclass)`);
    const lastAnalyze = async () =>
      ((await ds.query(`SELECT last_analyze FROM pg_stat_user_tables WHERE relname = 'roster_entries'`)) as Array<{ last_analyze: Date | null }>)[0]!
        .last_analyze;
    expect(await lastAnalyze()).toBeNull();
    await upload(
      hyg,
      'kind=cases&mode=check',
      'case_ref,worker_key,outcome,onset_date,status\n{W}-STATS-1,{W}90,{OA},2025-04-10,confirmed\n',
      'cases.csv',
    ).expect(201);
    expect(await lastAnalyze()).not.toBeNull();
  });
});

import { randomBytes } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createApp } from '@ratewarden/api/app';
import { configChangeSchema, exposureGroupSchema, outcomeSchema } from '@ratewarden/shared/groups';
import { provisionUser, signIn, type SignedInAgent } from '../support/sign-in';
import { testApiConfig } from '../support/test-config';
import { openTestDataSource } from '../support/test-db';

/** Exposure groups and outcomes through the API: the hygienist edits, everyone else only reads. */
describe('exposure group and outcome routes', () => {
  let ds: DataSource;
  let app: ReturnType<typeof createApp>;
  let as: Record<'hygienist' | 'safety' | 'physician' | 'admin', SignedInAgent>;
  let previousReference: number | null;
  const tag = randomBytes(3).toString('hex').toUpperCase();

  const write = (who: SignedInAgent, method: 'post' | 'patch' | 'put', path: string, body?: object) =>
    who.agent[method](path)
      .set('x-csrf-token', who.csrf)
      .send(body ?? {});

  beforeAll(async () => {
    ds = await openTestDataSource();
    const ref = (await ds.query(`SELECT id FROM exposure_groups WHERE is_reference`)) as Array<{ id: number }>;
    previousReference = ref[0]?.id ?? null;
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist');
    await provisionUser(ds, 'safety@demo.ratewarden.test', 'safety_manager');
    await provisionUser(ds, 'physician@demo.ratewarden.test', 'physician');
    await provisionUser(ds, 'admin@demo.ratewarden.test', 'administrator');
    app = createApp({ dataSource: ds, config: testApiConfig() });
    as = {
      hygienist: await signIn(app, 'hygienist@demo.ratewarden.test'),
      safety: await signIn(app, 'safety@demo.ratewarden.test'),
      physician: await signIn(app, 'physician@demo.ratewarden.test'),
      admin: await signIn(app, 'admin@demo.ratewarden.test'),
    };
  });
  afterAll(async () => {
    // The global reference group is shared by the test database: put the earlier one back.
    await ds.query(`UPDATE exposure_groups SET is_reference = false WHERE is_reference`);
    if (previousReference !== null) await ds.query(`UPDATE exposure_groups SET is_reference = true WHERE id = $1`, [previousReference]);
    await ds?.destroy();
  });

  const history = async (path: string) => ((await as.safety.agent.get(path).expect(200)).body as unknown[]).map((h) => configChangeSchema.parse(h));

  it('creates an exposure group (code upper-cased) and refuses the same code twice', async () => {
    const res = await write(as.hygienist, 'post', '/api/groups', {
      code: ` grind${tag} `,
      name: 'Grinding',
      hazard: 'respirable silica',
      exposureLevel: 2,
    }).expect(201);
    const g = exposureGroupSchema.parse(res.body);
    expect(g).toMatchObject({ code: `GRIND${tag}`, name: 'Grinding', hazard: 'respirable silica', exposureLevel: 2, isReference: false, description: null });
    await write(as.hygienist, 'post', '/api/groups', { code: `GRIND${tag}`, name: 'Again', hazard: 'x', exposureLevel: 1 }).expect(409);
    const bad = await write(as.hygienist, 'post', '/api/groups', { code: 'no spaces', name: 'x', hazard: 'x', exposureLevel: 1 }).expect(422);
    expect(JSON.stringify(bad.body)).toMatch(/code/);
    // Every role reads the list.
    const list = (await as.physician.agent.get('/api/groups').expect(200)).body as Array<{ code: string }>;
    expect(list.map((x) => x.code)).toContain(`GRIND${tag}`);
  });

  it('edits a group and keeps each change, with before and after, in the history', async () => {
    const g = exposureGroupSchema.parse(
      (await write(as.hygienist, 'post', '/api/groups', { code: `WELD${tag}`, name: 'Welding', hazard: 'fume', exposureLevel: 1 }).expect(201)).body,
    );
    const edited = exposureGroupSchema.parse(
      (await write(as.hygienist, 'patch', `/api/groups/${g.id}`, { name: 'Welding bay', description: 'MIG and TIG' }).expect(200)).body,
    );
    expect(edited).toMatchObject({ id: g.id, code: `WELD${tag}`, name: 'Welding bay', hazard: 'fume', exposureLevel: 1, description: 'MIG and TIG' });
    const h = await history(`/api/groups/${g.id}/history`);
    expect(h.map((x) => x.action)).toEqual(['group.update', 'group.create']);
    expect(h[0]).toMatchObject({
      actor: expect.stringContaining('hygienist@demo.ratewarden.test'),
      before: { name: 'Welding', description: null },
      after: { name: 'Welding bay', description: 'MIG and TIG' },
    });
    expect(h[1]!.before).toBeNull();
    await write(as.hygienist, 'patch', '/api/groups/999999999', { name: 'x' }).expect(404);
  });

  it('sets the reference group: exactly one, and the old one is told so in its history', async () => {
    const a = exposureGroupSchema.parse(
      (await write(as.hygienist, 'post', '/api/groups', { code: `OFFA${tag}`, name: 'Office A', hazard: 'none', exposureLevel: 0 }).expect(201)).body,
    );
    const b = exposureGroupSchema.parse(
      (await write(as.hygienist, 'post', '/api/groups', { code: `OFFB${tag}`, name: 'Office B', hazard: 'none', exposureLevel: 0 }).expect(201)).body,
    );
    await write(as.hygienist, 'post', `/api/groups/${a.id}/reference`).expect(200);
    const after = ((await write(as.hygienist, 'post', `/api/groups/${b.id}/reference`).expect(200)).body as unknown[]).map((x) => exposureGroupSchema.parse(x));
    expect(after.filter((x) => x.isReference).map((x) => x.id)).toEqual([b.id]);
    const ha = await history(`/api/groups/${a.id}/history`);
    expect(ha[0]).toMatchObject({ action: 'group.update', before: { isReference: true }, after: { isReference: false } });
    const hb = await history(`/api/groups/${b.id}/history`);
    expect(hb[0]).toMatchObject({ action: 'group.set_reference', before: { isReference: false }, after: { isReference: true } });
  });

  it('sets ordinal levels in one change, recording only the groups that moved', async () => {
    const mk = async (code: string, level: number | null) =>
      exposureGroupSchema.parse(
        (await write(as.hygienist, 'post', '/api/groups', { code: `${code}${tag}`, name: code, hazard: 'noise', exposureLevel: level }).expect(201)).body,
      );
    const low = await mk('LOW', 1);
    const mid = await mk('MID', 2);
    const high = await mk('HIGH', 2);
    const res = await write(as.hygienist, 'put', '/api/groups/levels', {
      levels: [
        { id: low.id, exposureLevel: 1 },
        { id: mid.id, exposureLevel: 2 },
        { id: high.id, exposureLevel: 3 },
      ],
    }).expect(200);
    const levels = new Map((res.body as Array<{ id: number; exposureLevel: number | null }>).map((x) => [x.id, x.exposureLevel]));
    expect([levels.get(low.id), levels.get(mid.id), levels.get(high.id)]).toEqual([1, 2, 3]);
    expect((await history(`/api/groups/${high.id}/history`))[0]).toMatchObject({ before: { exposureLevel: 2 }, after: { exposureLevel: 3 } });
    expect((await history(`/api/groups/${low.id}/history`)).map((x) => x.action)).toEqual(['group.create']);
    // A level leaves the trend when null; negative levels are refused.
    await write(as.hygienist, 'put', '/api/groups/levels', { levels: [{ id: mid.id, exposureLevel: null }] }).expect(200);
    await write(as.hygienist, 'put', '/api/groups/levels', { levels: [{ id: mid.id, exposureLevel: -1 }] }).expect(422);
  });

  it('creates and edits an outcome with its own reference group, history kept', async () => {
    const ref = exposureGroupSchema.parse(
      (await write(as.hygienist, 'post', '/api/groups', { code: `ADMIN${tag}`, name: 'Administration', hazard: 'none', exposureLevel: 0 }).expect(201)).body,
    );
    const created = outcomeSchema.parse(
      (
        await write(as.hygienist, 'post', '/api/outcomes', {
          code: `NIHL${tag}`,
          name: 'Noise-induced hearing loss',
          caseDefinition: 'Standard threshold shift confirmed by retest',
          countingRule: 'first_event',
        }).expect(201)
      ).body,
    );
    expect(created).toMatchObject({ code: `NIHL${tag}`, countingRule: 'first_event', lagMonths: 0, referenceGroupId: null });
    const edited = outcomeSchema.parse(
      (await write(as.hygienist, 'patch', `/api/outcomes/${created.id}`, { referenceGroupId: ref.id, lagMonths: 6 }).expect(200)).body,
    );
    expect(edited).toMatchObject({ referenceGroupId: ref.id, lagMonths: 6, name: 'Noise-induced hearing loss' });
    const bad = await write(as.hygienist, 'patch', `/api/outcomes/${created.id}`, { referenceGroupId: 999999999 }).expect(422);
    expect(JSON.stringify(bad.body)).toMatch(/referenceGroupId/);
    const h = await history(`/api/outcomes/${created.id}/history`);
    expect(h.map((x) => x.action)).toEqual(['outcome.update', 'outcome.create']);
    expect(h[0]).toMatchObject({ before: { referenceGroupId: null, lagMonths: 0 }, after: { referenceGroupId: ref.id, lagMonths: 6 } });
    const list = (await as.admin.agent.get('/api/outcomes').expect(200)).body as Array<{ code: string }>;
    expect(list.map((o) => o.code)).toContain(`NIHL${tag}`);
  });

  it('refuses every write to the roles other than the hygienist, changing nothing', async () => {
    const g = exposureGroupSchema.parse(
      (await write(as.hygienist, 'post', '/api/groups', { code: `LOCK${tag}`, name: 'Locked', hazard: 'x', exposureLevel: 1 }).expect(201)).body,
    );
    const o = outcomeSchema.parse(
      (await write(as.hygienist, 'post', '/api/outcomes', { code: `LOCKO${tag}`, name: 'Locked', caseDefinition: 'x', countingRule: 'recurrent' }).expect(201))
        .body,
    );
    for (const who of [as.safety, as.physician, as.admin]) {
      await write(who, 'post', '/api/groups', { code: `X${tag}`, name: 'x', hazard: 'x', exposureLevel: 1 }).expect(403);
      await write(who, 'patch', `/api/groups/${g.id}`, { name: 'changed' }).expect(403);
      await write(who, 'post', `/api/groups/${g.id}/reference`).expect(403);
      await write(who, 'put', '/api/groups/levels', { levels: [{ id: g.id, exposureLevel: 5 }] }).expect(403);
      await write(who, 'post', '/api/outcomes', { code: `XO${tag}`, name: 'x', caseDefinition: 'x', countingRule: 'recurrent' }).expect(403);
      await write(who, 'patch', `/api/outcomes/${o.id}`, { name: 'changed' }).expect(403);
    }
    const [now] = (await ds.query(`SELECT name, exposure_level, is_reference FROM exposure_groups WHERE id = $1`, [g.id])) as Array<Record<string, unknown>>;
    expect(now).toEqual({ name: 'Locked', exposure_level: 1, is_reference: false });
    expect(await ds.query(`SELECT count(*)::int AS n FROM exposure_groups WHERE code = $1`, [`X${tag}`])).toEqual([{ n: 0 }]);
    expect((await history(`/api/groups/${g.id}/history`)).map((x) => x.action)).toEqual(['group.create']);
    expect((await history(`/api/outcomes/${o.id}/history`)).map((x) => x.action)).toEqual(['outcome.create']);
  });
});

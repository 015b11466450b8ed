import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { openTestDataSource } from '../support/test-db';
import { writeFixture, type WriteFixture } from './patch-fixture';

/**
 * A PATCH that changes nothing answers 200 with the object as it was, and writes neither the row
 * (its updatedAt stays) nor an audit event; a PATCH naming some fields leaves the others alone.
 */
describe('PATCH without a change, and partial PATCHes', () => {
  let ds: DataSource;
  let f: WriteFixture;

  beforeAll(async () => {
    ds = await openTestDataSource();
    f = await writeFixture(ds);
  });
  afterAll(async () => {
    await ds.destroy();
  });

  async function expectNoOp(who: 'admin' | 'hygienist' | 'safety', path: string, read: string, target: string, bodies: object[]): Promise<void> {
    const before = (await f.as[who].agent.get(read).expect(200)).body as unknown;
    const audits = await f.audits(target);
    for (const body of bodies) {
      const res = await f.write(f.as[who], 'patch', path, body);
      expect(res.status, JSON.stringify(body)).toBe(200);
      expect(res.body).toEqual(before);
    }
    expect((await f.as[who].agent.get(read).expect(200)).body).toEqual(before);
    expect(await f.audits(target)).toBe(audits);
  }

  it('a watch rule', async () => {
    const rule = (await f.as.safety.agent.get(`/api/rules/${f.ruleId}`).expect(200)).body as { name: string; threshold: number; recipients: string[] };
    await expectNoOp('safety', `/api/rules/${f.ruleId}`, `/api/rules/${f.ruleId}`, `watch_rule:${f.ruleId}`, [
      {},
      { name: ` ${rule.name} ` },
      { threshold: rule.threshold, recipients: rule.recipients.map((r) => r.toUpperCase()), active: true },
    ]);
  });

  it('an exposure group', async () => {
    const read = async () => ((await f.as.hygienist.agent.get('/api/groups').expect(200)).body as Array<{ id: number }>).find((g) => g.id === f.groupId)!;
    const group = await read();
    const audits = await f.audits(`exposure_group:${f.groupId}`);
    for (const body of [{}, { name: 'Patch group', exposureLevel: 2 }, { description: ' kept ' }]) {
      expect((await f.write(f.as.hygienist, 'patch', `/api/groups/${f.groupId}`, body).expect(200)).body).toEqual(group);
    }
    expect(await read()).toEqual(group);
    expect(await f.audits(`exposure_group:${f.groupId}`)).toBe(audits);
  });

  it('an outcome', async () => {
    const read = async () => ((await f.as.hygienist.agent.get('/api/outcomes').expect(200)).body as Array<{ id: number }>).find((o) => o.id === f.outcomeId)!;
    const outcome = await read();
    const audits = await f.audits(`outcome:${f.outcomeId}`);
    for (const body of [{}, { lagMonths: 6, countingRule: 'recurrent', referenceGroupId: null }]) {
      expect((await f.write(f.as.hygienist, 'patch', `/api/outcomes/${f.outcomeId}`, body).expect(200)).body).toEqual(outcome);
    }
    expect(await read()).toEqual(outcome);
    expect(await f.audits(`outcome:${f.outcomeId}`)).toBe(audits);
  });

  it("a person's access (the same sites in another order count as the same)", async () => {
    const read = async () => ((await f.as.admin.agent.get('/api/admin/users').expect(200)).body as Array<{ id: string }>).find((u) => u.id === f.personId)!;
    const person = await read();
    const [a, b] = f.siteIds;
    for (const body of [
      { role: 'hygienist', siteIds: [b, a] },
      { role: 'hygienist', siteIds: [a, b, a] },
    ]) {
      expect((await f.write(f.as.admin, 'patch', `/api/admin/users/${f.personId}`, body).expect(200)).body).toEqual(person);
    }
    expect(await f.audits(`user:${f.personId}`)).toBe(0);
    const changed = await f.write(f.as.admin, 'patch', `/api/admin/users/${f.personId}`, { role: 'hygienist', siteIds: [a] }).expect(200);
    expect(changed.body.siteIds).toEqual([a]);
    expect(await f.audits(`user:${f.personId}`)).toBe(1);
  });

  it('a partial PATCH changes what it names, leaves the rest, and is audited once', async () => {
    const rule = (await f.write(f.as.safety, 'patch', `/api/rules/${f.ruleId}`, { name: `Renamed ${f.tag}` }).expect(200)).body;
    expect(rule).toMatchObject({
      name: `Renamed ${f.tag}`,
      exposureGroupId: f.groupId,
      threshold: 1.5,
      minCases: 5,
      recipients: ['watch@kestrelmoor.test'],
      active: true,
    });
    const group = (await f.write(f.as.hygienist, 'patch', `/api/groups/${f.groupId}`, { name: 'Renamed group' }).expect(200)).body;
    expect(group).toMatchObject({ name: 'Renamed group', description: 'kept', exposureLevel: 2 });
    const outcome = (await f.write(f.as.hygienist, 'patch', `/api/outcomes/${f.outcomeId}`, { name: 'Renamed outcome' }).expect(200)).body;
    expect(outcome).toMatchObject({ name: 'Renamed outcome', lagMonths: 6, referenceGroupId: null });
    expect(await f.audits(`watch_rule:${f.ruleId}`)).toBe(2);
    expect(await f.audits(`exposure_group:${f.groupId}`)).toBe(2);
    expect(await f.audits(`outcome:${f.outcomeId}`)).toBe(2);
  });
});

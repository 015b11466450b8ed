import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createApp } from '@ratewarden/api/app';
import { applyIntake } from '@ratewarden/api/features/intake/intake-service';
import { reasons } from '@ratewarden/shared/intake-columns';
import { intakeListResponseSchema } from '@ratewarden/shared/intake-schemas';
import { provisionUser, signIn, type SignedInAgent } from '../support/sign-in';
import { testApiConfig } from '../support/test-config';
import { openTestDataSource } from '../support/test-db';
import { makeCorner, type Corner } from './intake-support';

/**
 * Checked intakes that are never applied used to keep their UNLOGGED staging tables for ever.
 * After INTAKE_EXPIRY_HOURS (here 48) an intake request expires them: rejected with the reason
 * that they expired, staging tables dropped, apply refused with that reason.
 */
describe('expiry of checked intakes', () => {
  let ds: DataSource;
  let c: Corner;
  let hyg: SignedInAgent;
  let n = 0;
  const roster = () => `worker_key,site,exposure_group,month,hours,birth_year,sex\n{W}${++n},{S1},{GA},2025-01,160,1980,F\n`;
  const upload = async () =>
    (
      await hyg.agent
        .post('/api/intakes?kind=roster&mode=check')
        .set('x-csrf-token', hyg.csrf)
        .attach('file', Buffer.from(c.fill(roster())), { filename: 'wait.csv', contentType: 'text/csv' })
        .expect(201)
    ).body.intake as { id: string };
  const tablesOf = async (id: string) =>
    (await ds.query(`SELECT count(*)::int AS n FROM pg_tables WHERE schemaname = 'intake_staging' AND tablename LIKE $1`, [`s_${id.replace(/-/g, '')}%`]))[0]
      .n as number;
  const age = (id: string, hours: number) => ds.query(`UPDATE intakes SET checked_at = now() - $2 * interval '1 hour' WHERE id = $1`, [id, hours]);
  const stateOf = async (id: string) => (await ds.query(`SELECT state, problems, staging_table FROM intakes WHERE id = $1`, [id]))[0];

  beforeAll(async () => {
    ds = await openTestDataSource();
    c = await makeCorner(ds);
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', c.siteIds);
    hyg = await signIn(createApp({ dataSource: ds, config: testApiConfig({ INTAKE_EXPIRY_HOURS: '48' }) }), 'hygienist@demo.ratewarden.test');
  });
  afterAll(async () => {
    await ds?.destroy();
  });

  it('expires a checked intake older than the setting on the next intake request, dropping its staging tables', async () => {
    const young = await upload();
    const old = await upload();
    expect(await tablesOf(old.id)).toBe(3);
    await age(young.id, 47);
    await age(old.id, 49);
    const list = intakeListResponseSchema.parse((await hyg.agent.get('/api/intakes?kind=roster').expect(200)).body);
    expect(list.items.find((i) => i.id === old.id)).toMatchObject({ state: 'rejected', staged: false, problemCount: 1 });
    expect(list.items.find((i) => i.id === young.id)).toMatchObject({ state: 'checked', staged: true });
    expect(await tablesOf(old.id)).toBe(0);
    expect(await tablesOf(young.id)).toBe(3);
    expect((await stateOf(old.id)).problems).toEqual([{ line: null, column: null, value: null, reason: reasons.intakeExpired(48) }]);
    expect(await ds.query(`SELECT actor_label FROM audit_events WHERE action = 'intake.expire' AND target = $1`, [`intake:${old.id}`])).toEqual([
      { actor_label: 'anonymous' },
    ]);

    const refused = await hyg.agent.post(`/api/intakes/${old.id}/apply`).set('x-csrf-token', hyg.csrf).expect(409);
    expect(refused.body.message).toBe(`only a checked intake can be applied; this one is rejected: ${reasons.intakeExpired(48)}`);
    // The young one still applies.
    await hyg.agent.post(`/api/intakes/${young.id}/apply`).set('x-csrf-token', hyg.csrf).expect(200);
  });

  it('refuses, and expires, an intake found too old at apply', async () => {
    const it1 = await upload();
    await age(it1.id, 30);
    await expect(applyIntake(ds, c.principal, it1.id, null, { expiryHours: 24 })).rejects.toMatchObject({
      status: 409,
      message: `only a checked intake can be applied; this one is rejected: ${reasons.intakeExpired(24)}`,
    });
    expect(await stateOf(it1.id)).toMatchObject({ state: 'rejected', staging_table: null });
    expect(await tablesOf(it1.id)).toBe(0);
    expect(await ds.query(`SELECT count(*)::int AS n FROM roster_entries WHERE intake_id = $1`, [it1.id])).toEqual([{ n: 0 }]);
  });

  it('drops staging tables that no intake names', async () => {
    const stray = `s_${'cd'.repeat(16)}`;
    await ds.query(`CREATE UNLOGGED TABLE intake_staging.${stray} (x int)`);
    await ds.query(`CREATE UNLOGGED TABLE intake_staging.${stray}_w (x int)`);
    await hyg.agent.get('/api/intakes').expect(200);
    expect(await ds.query(`SELECT tablename FROM pg_tables WHERE schemaname = 'intake_staging' AND tablename LIKE $1`, [`${stray}%`])).toEqual([]);
  });
});

import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createApp } from '@ratewarden/api/app';
import { caseConflictSchema, caseDetailSchema } from '@ratewarden/shared/cases';
import { intakeDetailSchema, intakeUploadResponseSchema } from '@ratewarden/shared/intake-schemas';
import { provisionUser, signIn, type SignedInAgent } from '../support/sign-in';
import { testApiConfig } from '../support/test-config';
import { openTestDataSource } from '../support/test-db';
import { makeCorner, type Corner } from './intake-support';

const rosterCsv = (rows: string[]) => `worker_key,site,exposure_group,month,hours,birth_year,sex\n${rows.join('\n')}\n`;
const casesCsv = (rows: string[]) => `case_ref,worker_key,outcome,onset_date,status\n${rows.join('\n')}\n`;

/**
 * A later case list that contradicts a physician's decision: the intake waits, the physician sees
 * each conflict and keeps the decision or accepts the list, and only then is the list applied,
 * without the rows of the cases whose decision was kept.
 */
describe("case lists that contradict a physician's decision", () => {
  let ds: DataSource;
  let c: Corner;
  let app: ReturnType<typeof createApp>;
  const as = {} as Record<'hygienist' | 'physician', SignedInAgent>;
  let laterId: string;
  const ref = (i: number) => `${c.codes.W}K${i}`;

  const upload = (body: string, mode: 'check' | 'apply') =>
    as.hygienist.agent
      .post(`/api/intakes?kind=cases&mode=${mode}`)
      .set('x-csrf-token', as.hygienist.csrf)
      .attach('file', Buffer.from(c.fill(body)), { filename: 'cases.csv', contentType: 'text/csv' });
  const review = (i: number, decision: string, reason: string) =>
    as.physician.agent
      .post(`/api/cases/${ref(i)}/review`)
      .set('x-csrf-token', as.physician.csrf)
      .send({ decision, reason })
      .expect(200);
  const caseOf = async (i: number) => caseDetailSchema.parse((await as.physician.agent.get(`/api/cases/${ref(i)}`).expect(200)).body);

  beforeAll(async () => {
    ds = await openTestDataSource();
    c = await makeCorner(ds);
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', c.siteIds);
    await provisionUser(ds, 'physician@demo.ratewarden.test', 'physician', c.siteIds);
    app = createApp({ dataSource: ds, config: testApiConfig() });
    as.hygienist = await signIn(app, 'hygienist@demo.ratewarden.test');
    as.physician = await signIn(app, 'physician@demo.ratewarden.test');
    const rows = [...Array(6).keys()].map((i) => `{W}B${i},{S1},{GB},2024-03,160,1981,M`);
    await as.hygienist.agent
      .post('/api/intakes?kind=roster&mode=apply')
      .set('x-csrf-token', as.hygienist.csrf)
      .attach('file', Buffer.from(c.fill(rosterCsv(rows))), { filename: 'roster.csv', contentType: 'text/csv' })
      .expect(201);
    await upload(casesCsv([0, 1, 2, 3].map((i) => `{W}K${i},{W}B${i},{OB},2024-03-0${i + 1},suspected`)), 'apply').expect(201);
    // The physician confirms K0 and rules out K1.
    await review(0, 'confirm', 'Confirmed on the repeat test');
    await review(1, 'rule_out', 'Temporary shift; normal on retest');
  });
  afterAll(async () => {
    await ds?.destroy();
  });

  it('a later list saying otherwise waits for the physician: no silent overwrite', async () => {
    // K0 and K1 back to suspected (both contradict a decision), K2 confirmed (no decision on it), K3 unchanged.
    const later = casesCsv([
      `{W}K0,{W}B0,{OB},2024-03-01,suspected`,
      `{W}K1,{W}B1,{OB},2024-03-02,suspected`,
      `{W}K2,{W}B2,{OB},2024-03-03,confirmed`,
      `{W}K3,{W}B3,{OB},2024-03-04,suspected`,
    ]);
    const res = intakeUploadResponseSchema.parse((await upload(later, 'apply').expect(201)).body);
    laterId = res.intake.id;
    // Asked to apply, it stays checked: the physician decides first.
    expect(res.intake).toMatchObject({ state: 'checked', conflictsPending: true });
    expect((await caseOf(0)).status).toBe('confirmed');
    // The hygienist learns that it waits, not which cases: those are case-level.
    const seen = (await as.hygienist.agent.get(`/api/intakes/${laterId}`).expect(200)).text;
    expect(seen).not.toContain(ref(0));
    await as.hygienist.agent.get(`/api/cases/conflicts/${laterId}`).expect(403);
    const refused = await as.hygienist.agent.post(`/api/intakes/${laterId}/apply`).set('x-csrf-token', as.hygienist.csrf).expect(409);
    expect(refused.body.message).toMatch(/physician/);
  });

  it('the physician sees each conflict with the decision, keeps one and accepts the other; then the list applies', async () => {
    const conflicts = caseConflictSchema.array().parse((await as.physician.agent.get(`/api/cases/conflicts/${laterId}`).expect(200)).body);
    expect(conflicts.map((k) => [k.caseRef, k.decidedStatus, k.listStatus, k.resolution])).toEqual([
      [ref(0), 'confirmed', 'suspected', null],
      [ref(1), 'ruled_out', 'suspected', null],
    ]);
    expect(conflicts[0]!.decision).toMatchObject({ reason: 'Confirmed on the repeat test', decidedBy: 'physician@demo.ratewarden.test' });
    await as.hygienist.agent
      .post(`/api/cases/conflicts/${laterId}/${ref(0)}`)
      .set('x-csrf-token', as.hygienist.csrf)
      .send({ resolution: 'keep' })
      .expect(403);
    await as.physician.agent
      .post(`/api/cases/conflicts/${laterId}/${ref(0)}`)
      .set('x-csrf-token', as.physician.csrf)
      .send({ resolution: 'maybe' })
      .expect(422);
    await as.physician.agent
      .post(`/api/cases/conflicts/${laterId}/${ref(0)}`)
      .set('x-csrf-token', as.physician.csrf)
      .send({ resolution: 'keep' })
      .expect(200);
    // One left: still refused.
    await as.hygienist.agent.post(`/api/intakes/${laterId}/apply`).set('x-csrf-token', as.hygienist.csrf).expect(409);
    const after = caseConflictSchema.array().parse(
      (
        await as.physician.agent
          .post(`/api/cases/conflicts/${laterId}/${ref(1)}`)
          .set('x-csrf-token', as.physician.csrf)
          .send({ resolution: 'accept' })
          .expect(200)
      ).body,
    );
    expect(after.map((k) => k.resolution)).toEqual(['keep', 'accept']);
    const applied = intakeDetailSchema.parse(
      (await as.hygienist.agent.post(`/api/intakes/${laterId}/apply`).set('x-csrf-token', as.hygienist.csrf).expect(200)).body,
    );
    expect(applied).toMatchObject({ state: 'applied', conflictsPending: false });

    // K0: the decision kept, no version from the later list. K1: the list's status accepted, a new version of the later list.
    const k0 = await caseOf(0);
    expect(k0).toMatchObject({ status: 'confirmed', reviewed: true });
    expect(k0.history.map((v) => [v.status, v.intakeId === laterId])).toEqual([
      ['suspected', false],
      ['confirmed', false],
    ]);
    const k1 = await caseOf(1);
    expect(k1).toMatchObject({ status: 'suspected', reviewed: false, intakeId: laterId });
    expect(k1.history.map((v) => v.status)).toEqual(['suspected', 'ruled_out', 'suspected']);
    expect((await caseOf(2)).status).toBe('confirmed');
    // Resolved conflicts cannot change once the list is applied.
    await as.physician.agent
      .post(`/api/cases/conflicts/${laterId}/${ref(0)}`)
      .set('x-csrf-token', as.physician.csrf)
      .send({ resolution: 'accept' })
      .expect(409);
    const audits = (await ds.query(`SELECT detail FROM audit_events WHERE action = 'case.conflict_resolve' AND target = $1 ORDER BY id`, [
      `intake:${laterId}`,
    ])) as Array<{ detail: { resolution: string } }>;
    expect(audits.map((a) => a.detail.resolution)).toEqual(['keep', 'accept']);
  });

  it('a list that agrees with the decision is applied without asking', async () => {
    const agreeing = casesCsv([`{W}K0,{W}B0,{OB},2024-03-01,confirmed`, `{W}K4,{W}B4,{OB},2024-03-05,suspected`]);
    const res = intakeUploadResponseSchema.parse((await upload(agreeing, 'apply').expect(201)).body);
    expect(res.intake).toMatchObject({ state: 'applied', conflictsPending: false });
    expect(await caseOf(0)).toMatchObject({ status: 'confirmed', reviewed: true });
  });

  it('restoring an earlier case list over a decision is refused, not done silently', async () => {
    // A fourth list changes the later list's two cases (K1 confirmed, K2 suspected): the later list is superseded.
    const fourth = casesCsv([`{W}K1,{W}B1,{OB},2024-03-02,confirmed`, `{W}K2,{W}B2,{OB},2024-03-03,suspected`]);
    expect(intakeUploadResponseSchema.parse((await upload(fourth, 'apply').expect(201)).body).intake.state).toBe('applied');
    const [laterState] = (await ds.query(`SELECT state FROM intakes WHERE id = $1`, [laterId])) as Array<{ state: string }>;
    expect(laterState!.state).toBe('superseded');
    // The physician rules K2 out; the later list had it confirmed: restoring that list would overrule the decision.
    await review(2, 'rule_out', 'Not work-related');
    const refused = await as.hygienist.agent.post(`/api/intakes/${laterId}/restore`).set('x-csrf-token', as.hygienist.csrf).expect(409);
    expect(refused.body.message).toMatch(/physician's decision/);
    expect((await caseOf(2)).status).toBe('ruled_out');
    // Once the decision agrees with what the list says (confirmed), the restore goes through and the status stays.
    await review(2, 'confirm', 'Confirmed after all');
    await as.hygienist.agent.post(`/api/intakes/${laterId}/restore`).set('x-csrf-token', as.hygienist.csrf).expect(200);
    expect((await caseOf(2)).status).toBe('confirmed');
  });
});

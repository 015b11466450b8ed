import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createApp } from '@ratewarden/api/app';
import { intakeDetailSchema, intakeUploadResponseSchema } from '@ratewarden/shared/intake-schemas';
import { runDetailSchema } from '@ratewarden/shared/runs';
import { unattributedListSchema } from '@ratewarden/shared/unattributed';
import { performRun } from '@ratewarden/worker/runs/perform-run';
import { provisionUser, signIn, type SignedInAgent } from '../support/sign-in';
import { testApiConfig } from '../support/test-config';
import { allSiteIds, openTestDataSource } from '../support/test-db';
import { makeCorner, type Corner } from './intake-support';
import { clearCohortData, settings } from './runs-fixture';

const rosterCsv = (rows: string[]) => `worker_key,site,exposure_group,month,hours,birth_year,sex\n${rows.join('\n')}\n`;
const casesCsv = (rows: string[]) => `case_ref,worker_key,outcome,onset_date,status\n${rows.join('\n')}\n`;

/**
 * A month of data quality, through the API: a roster with March and April 2024 at one site; a case
 * list whose cases a run cannot all attribute (W4–W9 rostered from April only, on an outcome with a
 * one-month lag: no roster row in March; W1's lagged case of March falls in February, before the
 * first rostered month); then a roster correction of March that drops W2, whose confirmed case
 * loses its roster row. Expected counts worked out by hand beside each check.
 */
describe('unattributed cases: the roster check that orphans one, the run that counts them, the physician who lists them', () => {
  let ds: DataSource;
  let c: Corner;
  let app: ReturnType<typeof createApp>;
  const as = {} as Record<'hygienist' | 'physician' | 'safety' | 'partial', SignedInAgent>;
  let OC: string;
  let outcomeIds: Record<'OA' | 'OB' | 'OC', number>;
  let correctionId: string;
  let runId: string;

  const upload = (kind: 'roster' | 'cases', body: string, mode: 'check' | 'apply') =>
    as.hygienist.agent
      .post(`/api/intakes?kind=${kind}&mode=${mode}`)
      .set('x-csrf-token', as.hygienist.csrf)
      .attach('file', Buffer.from(c.fill(body)), { filename: `${kind}.csv`, contentType: 'text/csv' });

  beforeAll(async () => {
    ds = await openTestDataSource();
    // Runs are company-wide: no other file's cohort may be in them.
    await clearCohortData(ds);
    c = await makeCorner(ds);
    OC = `OC${c.tag}`;
    await ds.query(`INSERT INTO outcomes (code, name, case_definition, counting_rule, lag_months) VALUES ($1, 'Outcome C (lagged)', 'test', 'recurrent', 1)`, [
      OC,
    ]);
    const ids = (await ds.query(`SELECT code, id FROM outcomes WHERE code = ANY($1)`, [[c.codes.OA, c.codes.OB, OC]])) as Array<{ code: string; id: number }>;
    const id = (code: string) => ids.find((o) => o.code === code)!.id;
    outcomeIds = { OA: id(c.codes.OA), OB: id(c.codes.OB), OC: id(OC) };
    const sites = await allSiteIds(ds);
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', sites);
    await provisionUser(ds, 'physician@demo.ratewarden.test', 'physician', sites);
    await provisionUser(ds, 'safety@demo.ratewarden.test', 'safety_manager', sites);
    await provisionUser(ds, 'newcomer@demo.ratewarden.test', 'safety_manager', [c.siteIds[0]!]);
    app = createApp({ dataSource: ds, config: testApiConfig() });
    as.hygienist = await signIn(app, 'hygienist@demo.ratewarden.test');
    as.physician = await signIn(app, 'physician@demo.ratewarden.test');
    as.safety = await signIn(app, 'safety@demo.ratewarden.test');
    as.partial = await signIn(app, 'newcomer@demo.ratewarden.test');

    const march = ['{W}1,{S1},{GA},2024-03,160,1980,F', '{W}2,{S1},{GB},2024-03,150,1981,M', '{W}3,{S1},{GB},2024-03,140,1982,F'];
    const april = [...march.map((r) => r.replace('2024-03', '2024-04')), ...[4, 5, 6, 7, 8, 9].map((n) => `{W}${n},{S1},{GA},2024-04,100,1990,M`)];
    await upload('roster', rosterCsv([...march, ...april]), 'apply').expect(201);
    await upload(
      'cases',
      casesCsv([
        `{W}R2,{W}2,{OB},2024-03-10,confirmed`,
        `{W}R3,{W}3,{OB},2024-03-15,confirmed`,
        ...[4, 5, 6, 7, 8, 9].map((n) => `{W}N${n},{W}${n},${OC},2024-04-05,confirmed`),
        `{W}L1,{W}1,${OC},2024-03-20,confirmed`,
        `{W}A1,{W}1,${OC},2024-04-10,confirmed`,
      ]),
      'apply',
    ).expect(201);
  });
  afterAll(async () => {
    await provisionUser(ds, 'newcomer@demo.ratewarden.test', null);
    await ds?.destroy();
  });

  it('the correction check names the worker it removes and says it orphans one case; the case reference is the physician’s only', async () => {
    // March again without W2; W3's hours changed, W1 moved to GB, W10 added.
    const res = await upload(
      'roster',
      rosterCsv(['{W}1,{S1},{GB},2024-03,160,1980,F', '{W}3,{S1},{GB},2024-03,141,1982,F', '{W}10,{S1},{GA},2024-03,80,1995,F']),
      'check',
    ).expect(201);
    const { intake } = intakeUploadResponseSchema.parse(res.body);
    correctionId = intake.id;
    expect(intake.state).toBe('checked');
    const d = intake.diff!;
    if (d.kind !== 'roster') throw new Error('a roster diff was expected');
    expect(d.slices).toHaveLength(1);
    expect(d.slices[0]).toMatchObject({
      siteCode: c.codes.S1,
      month: '2024-03',
      stored: true,
      added: 1,
      removed: 1,
      moved: 1,
      hoursChanged: 1,
      unchanged: 0,
      workers: { added: [`${c.codes.W}10`], removed: [`${c.codes.W}2`], moved: [`${c.codes.W}1`], hoursChanged: [`${c.codes.W}3`] },
    });
    // One case orphaned: a count of 1 is small, so the hygienist reads "withheld", and no case reference.
    expect(d.orphanedCases).toEqual({ count: null, withheld: 'small' });
    expect(res.text).not.toContain(`${c.codes.W}R2`);

    const hyg = await as.hygienist.agent.get(`/api/intakes/${intake.id}`).expect(200);
    expect(intakeDetailSchema.parse(hyg.body).diff).toMatchObject({ orphanedCases: { count: null, withheld: 'small' } });
    expect(hyg.text).not.toContain(`${c.codes.W}R2`);
    await as.safety.agent.get(`/api/intakes/${intake.id}`).expect(403);

    const phys = await as.physician.agent.get(`/api/intakes/${intake.id}`).expect(200);
    expect(intakeDetailSchema.parse(phys.body).diff).toMatchObject({
      orphanedCases: {
        count: 1,
        withheld: null,
        cases: [
          {
            caseRef: `${c.codes.W}R2`,
            workerKey: `${c.codes.W}2`,
            outcomeCode: c.codes.OB,
            onsetDate: '2024-03-10',
            status: 'confirmed',
            siteCode: c.codes.S1,
            month: '2024-03',
          },
        ],
      },
    });
    const audits = (await ds.query(`SELECT count(*)::int AS n FROM audit_events WHERE action = 'cases.read' AND target = $1`, [
      `intake:${intake.id}`,
    ])) as Array<{ n: number }>;
    expect(audits[0]!.n).toBe(1);
  });

  it('after apply and a run, the run counts the unattributed cases by reason, withheld where small for everyone but the physician', async () => {
    await as.hygienist.agent.post(`/api/intakes/${correctionId}/apply`).set('x-csrf-token', as.hygienist.csrf).expect(200);
    const run = await performRun(ds, { trigger: 'cli', settings, appUrl: 'http://127.0.0.1:3000', consumeRequests: true });
    expect(run.status).toBe('succeeded');
    runId = (run as { runId: string }).runId;
    // The intake names the run that took its request up (the run lists the request among its inputs).
    const applied = intakeDetailSchema.parse((await as.hygienist.agent.get(`/api/intakes/${correctionId}`).expect(200)).body);
    expect(applied.runRequest).toMatchObject({ reason: 'roster intake applied', run: { id: runId, state: 'succeeded' } });
    expect(applied.runRequest!.pickedAt).not.toBeNull();

    const phys = runDetailSchema.parse((await as.physician.agent.get('/api/runs/current').expect(200)).body);
    const of = (d: typeof phys, outcome: number) => d.unattributed!.find((u) => u.outcomeId === outcome)!;
    // OB: R2 lost its row (removed by the correction); R3 is attributed.
    expect(of(phys, outcomeIds.OB)).toEqual({
      outcomeId: outcomeIds.OB,
      count: 1,
      withheld: null,
      reasons: [
        { reason: 'no_roster_month', count: 0, withheld: null },
        { reason: 'removed_by_correction', count: 1, withheld: null },
        { reason: 'lag_outside_data', count: 0, withheld: null },
      ],
    });
    // OC (lag 1): N4–N9 look at March, where W4–W9 have no row (6); L1 looks at February, before the data (1); A1 is attributed.
    expect(of(phys, outcomeIds.OC)).toMatchObject({ count: 7, reasons: [{ count: 6 }, { count: 0 }, { count: 1 }] });
    expect(of(phys, outcomeIds.OA)).toMatchObject({ count: 0 });
    // The stored set adds up with the cells: counted − attributed = unattributed, per outcome.
    const cases = phys.summary.cases as Array<{ outcomeId: number; counted: number; attributed: number }>;
    for (const t of cases) expect(t.counted - t.attributed, `outcome ${t.outcomeId}`).toBe(of(phys, t.outcomeId).count);
    expect(cases.find((t) => t.outcomeId === outcomeIds.OB)).toMatchObject({ counted: 2, attributed: 1 });
    expect(cases.find((t) => t.outcomeId === outcomeIds.OC)).toMatchObject({ counted: 8, attributed: 1 });

    for (const who of [as.hygienist, as.safety]) {
      const res = await who.agent.get(`/api/runs/${runId}`).expect(200);
      const seen = runDetailSchema.parse(res.body);
      // 1 is small: withheld, with every reason (they would give it back).
      expect(of(seen, outcomeIds.OB)).toEqual({
        outcomeId: outcomeIds.OB,
        count: null,
        withheld: 'small',
        reasons: ['no_roster_month', 'removed_by_correction', 'lag_outside_data'].map((reason) => ({ reason, count: null, withheld: 'total' })),
      });
      // 7 = 6 + 1: the 1 is small; with 7 shown and 6 withheld as its complement (≥ 5), the 1 would still be at
      // most 2, and no other part is left: the total is withheld (not small itself), and the reasons with it.
      expect(of(seen, outcomeIds.OC)).toMatchObject({ count: null, withheld: 'complement' });
      expect(of(seen, outcomeIds.OA)).toMatchObject({ count: 0, withheld: null });
      // The raw summary counts are the physician's.
      expect(seen.summary).not.toHaveProperty('cases');
      expect(seen.summary).not.toHaveProperty('unattributed');
    }
    // A reader of some sites only: unattributed cases have no site, so the company-wide count is not theirs.
    expect(runDetailSchema.parse((await as.partial.agent.get('/api/runs/current').expect(200)).body).unattributed).toBeNull();
  });

  it('lists the unattributed cases with their reasons to the physician, audited; 403 for everyone else', async () => {
    const res = await as.physician.agent.get('/api/runs/current/unattributed').expect(200);
    const list = unattributedListSchema.parse(res.body);
    expect(list.runId).toBe(runId);
    const byRef = new Map(list.cases.map((x) => [x.caseRef, x]));
    expect(byRef.get(`${c.codes.W}R2`)).toEqual({
      caseRef: `${c.codes.W}R2`,
      workerKey: `${c.codes.W}2`,
      outcomeId: outcomeIds.OB,
      onsetDate: '2024-03-10',
      status: 'confirmed',
      reason: 'removed_by_correction',
    });
    expect(byRef.get(`${c.codes.W}L1`)).toMatchObject({ reason: 'lag_outside_data', outcomeId: outcomeIds.OC });
    for (const n of [4, 5, 6, 7, 8, 9]) expect(byRef.get(`${c.codes.W}N${n}`)).toMatchObject({ reason: 'no_roster_month', workerKey: `${c.codes.W}${n}` });
    expect(list.cases).toHaveLength(8);
    const audits = (await ds.query(`SELECT count(*)::int AS n FROM audit_events WHERE action = 'cases.read' AND target = $1`, [
      `run:${runId}:unattributed`,
    ])) as Array<{ n: number }>;
    expect(audits[0]!.n).toBe(1);

    for (const who of [as.hygienist, as.safety]) {
      const denied = await who.agent.get('/api/runs/current/unattributed').expect(403);
      expect(denied.text).not.toContain(`${c.codes.W}R2`);
    }
  });
});

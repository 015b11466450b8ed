import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createApp } from '@ratewarden/api/app';
import { auditEventSchema } from '@ratewarden/shared/admin';
import { caseDetailSchema, caseReviewResultSchema, caseSummarySchema } from '@ratewarden/shared/cases';
import { performRun } from '@ratewarden/worker/runs/perform-run';
import { provisionUser, signIn, type SignedInAgent } from '../support/sign-in';
import { testApiConfig } from '../support/test-config';
import { allSiteIds, openTestDataSource } from '../support/test-db';
import { clearCohortData, currentRunId, makeCohort, settings, storedResults, type Cohort } from './runs-fixture';

/**
 * Case review: the physician confirms, rules out or reopens a case with a reason; the decision is
 * a new version of the case, requests a run, is audited, and the next run counts the case as
 * decided (runs count `confirmed` cases only here: `settings.countedStatuses`).
 */
describe('the case register and case review', () => {
  let ds: DataSource;
  let c: Cohort;
  let app: ReturnType<typeof createApp>;
  let as: Record<'physician' | 'hygienist' | 'safety' | 'admin', SignedInAgent>;
  const ref = (n: number) => `${c.tag}-C${n}`;
  const run = async () => {
    await performRun(ds, { trigger: 'cli', settings, appUrl: 'http://127.0.0.1:3000/' });
    const results = await storedResults(ds, (await currentRunId(ds))!, c.outcomes.REV!);
    return Number(results.get(`${c.groups.EXP}:month:2031-05`)!.cases);
  };

  /** The audit log is shared by every test file: this file reads only the entries written after this id. */
  let auditFrom = 0;

  beforeAll(async () => {
    ds = await openTestDataSource();
    await clearCohortData(ds);
    auditFrom = ((await ds.query(`SELECT coalesce(max(id), 0)::int AS id FROM audit_events`)) as [{ id: number }])[0].id;
    c = await makeCohort(ds, {
      groups: [
        ['REF', 0],
        ['EXP', 1],
      ],
      reference: 'REF',
      outcomes: [['REV', 'recurrent']],
    });
    const rows: Array<[number, string, number, number, number]> = [];
    const exposed: number[] = [];
    for (let i = 0; i < 6; i++) {
      const e = await c.worker(`e${i}`, 1980, 'F');
      exposed.push(e);
      rows.push([e, '2031-05-01', c.sites[0]!, c.groups.EXP!, 160]);
    }
    const r = await c.worker('r0', 1980, 'M');
    rows.push([r, '2031-05-01', c.sites[0]!, c.groups.REF!, 160]);
    await c.roster(rows);
    // C1–C3 confirmed, C4–C5 suspected, C6 a case of the reference group.
    await c.cases([
      [exposed[0]!, c.outcomes.REV!, '2031-05-03'],
      [exposed[1]!, c.outcomes.REV!, '2031-05-04'],
      [exposed[2]!, c.outcomes.REV!, '2031-05-05'],
      [exposed[3]!, c.outcomes.REV!, '2031-05-06', 'suspected'],
      [exposed[4]!, c.outcomes.REV!, '2031-05-07', 'suspected'],
      [r, c.outcomes.REV!, '2031-05-08'],
    ]);
    const sites = await allSiteIds(ds);
    await provisionUser(ds, 'physician@demo.ratewarden.test', 'physician', sites);
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', sites);
    await provisionUser(ds, 'safety@demo.ratewarden.test', 'safety_manager', sites);
    await provisionUser(ds, 'admin@demo.ratewarden.test', 'administrator');
    app = createApp({ dataSource: ds, config: testApiConfig() });
    as = {
      physician: await signIn(app, 'physician@demo.ratewarden.test'),
      hygienist: await signIn(app, 'hygienist@demo.ratewarden.test'),
      safety: await signIn(app, 'safety@demo.ratewarden.test'),
      admin: await signIn(app, 'admin@demo.ratewarden.test'),
    };
  });
  afterAll(async () => {
    await ds.destroy();
  });

  it('lists every case with its attribution, searchable, for the physician only, and audits the read', async () => {
    expect(await run()).toBe(3);
    for (const who of ['hygienist', 'safety', 'admin'] as const) await as[who].agent.get('/api/cases').expect(403);
    const all = caseSummarySchema.array().parse((await as.physician.agent.get(`/api/cases?outcomeId=${c.outcomes.REV}`).expect(200)).body);
    expect(all.map((x) => x.caseRef).sort()).toEqual([1, 2, 3, 4, 5, 6].map(ref).sort());
    const c1 = all.find((x) => x.caseRef === ref(1))!;
    expect(c1).toMatchObject({
      status: 'confirmed',
      siteId: c.sites[0],
      exposureGroupId: c.groups.EXP,
      intakeId: c.casesIntake,
      versions: 1,
      reviewed: false,
      attribution: { state: 'attributed' },
    });
    expect(all.find((x) => x.caseRef === ref(4))!.attribution).toMatchObject({ state: 'not_counted', reason: 'status not counted by the run' });
    const bySuspected = caseSummarySchema
      .array()
      .parse((await as.physician.agent.get(`/api/cases?outcomeId=${c.outcomes.REV}&status=suspected`).expect(200)).body);
    expect(bySuspected.map((x) => x.caseRef).sort()).toEqual([ref(4), ref(5)]);
    const byGroup = caseSummarySchema.array().parse((await as.physician.agent.get(`/api/cases?exposureGroupId=${c.groups.REF}`).expect(200)).body);
    expect(byGroup.map((x) => x.caseRef)).toEqual([ref(6)]);
    const byWorker = caseSummarySchema.array().parse((await as.physician.agent.get(`/api/cases?q=${c.tag}-e2`).expect(200)).body);
    expect(byWorker.map((x) => x.caseRef)).toEqual([ref(3)]);
    const outside = caseSummarySchema.array().parse((await as.physician.agent.get(`/api/cases?q=${c.tag}&from=2031-06&to=2031-07`).expect(200)).body);
    expect(outside).toEqual([]);
    const audits = (await ds.query(`SELECT actor_label, target FROM audit_events WHERE action = 'cases.read' AND target = 'case_register' AND id > $1`, [
      auditFrom,
    ])) as unknown[];
    expect(audits).toHaveLength(5);
  });

  it('confirms one case and rules out another, with reasons: new versions, a run request, audit entries, and the next run counts them', async () => {
    await as.hygienist.agent
      .post(`/api/cases/${ref(4)}/review`)
      .set('x-csrf-token', as.hygienist.csrf)
      .send({ decision: 'confirm', reason: 'audiogram repeated' })
      .expect(403);
    const noReason = await as.physician.agent
      .post(`/api/cases/${ref(4)}/review`)
      .set('x-csrf-token', as.physician.csrf)
      .send({ decision: 'confirm', reason: ' ' })
      .expect(422);
    expect(noReason.body.details).toEqual(expect.arrayContaining([expect.objectContaining({ path: 'reason' })]));
    await as.physician.agent
      .post(`/api/cases/${ref(1)}/review`)
      .set('x-csrf-token', as.physician.csrf)
      .send({ decision: 'confirm', reason: 'already confirmed' })
      .expect(409);
    const pendingBefore = Number(((await ds.query(`SELECT count(*) AS n FROM run_requests WHERE picked_at IS NULL`)) as Array<{ n: string }>)[0]!.n);

    const confirmed = caseReviewResultSchema.parse(
      (
        await as.physician.agent
          .post(`/api/cases/${ref(4)}/review`)
          .set('x-csrf-token', as.physician.csrf)
          .send({ decision: 'confirm', reason: 'Repeat audiogram after 16 h quiet shows the shift persists' })
          .expect(200)
      ).body,
    );
    expect(confirmed.case).toMatchObject({ status: 'confirmed', reviewed: true, versions: 2, intakeId: c.casesIntake, attribution: { state: 'not_counted' } });
    expect(confirmed.case.history.map((v) => [v.status, v.current, v.review?.decision ?? null])).toEqual([
      ['suspected', false, null],
      ['confirmed', true, 'confirm'],
    ]);
    expect(confirmed.case.history[1]!.review).toMatchObject({
      fromStatus: 'suspected',
      toStatus: 'confirmed',
      reason: 'Repeat audiogram after 16 h quiet shows the shift persists',
      decidedBy: 'physician@demo.ratewarden.test',
    });
    const ruledOut = caseReviewResultSchema.parse(
      (
        await as.physician.agent
          .post(`/api/cases/${ref(2)}/review`)
          .set('x-csrf-token', as.physician.csrf)
          .send({ decision: 'rule_out', reason: 'Shift explained by otitis media at the time of the test' })
          .expect(200)
      ).body,
    );
    expect(ruledOut.case).toMatchObject({ status: 'ruled_out', versions: 2 });

    const pending = (await ds.query(`SELECT id::text AS id, reason FROM run_requests WHERE picked_at IS NULL ORDER BY id`)) as Array<{
      id: string;
      reason: string;
    }>;
    expect(pending).toHaveLength(pendingBefore + 2);
    expect(pending.map((p) => p.id)).toEqual(expect.arrayContaining([confirmed.runRequestId, ruledOut.runRequestId]));
    // The request reads the same to everyone: no case reference in it.
    expect(pending.every((p) => !p.reason.includes(c.tag))).toBe(true);
    const reviews = (await ds.query(`SELECT target, detail FROM audit_events WHERE action = 'case.review' AND id > $1 ORDER BY id`, [auditFrom])) as Array<{
      target: string;
      detail: Record<string, unknown>;
    }>;
    expect(reviews.map((r) => r.detail.decision)).toEqual(['confirm', 'rule_out']);
    // Reasons are clinical: kept with the case, not in the log the administrator reads.
    expect(JSON.stringify(reviews)).not.toContain('audiogram');
    expect(JSON.stringify(reviews)).not.toContain(c.tag);

    // 3 confirmed + C4 confirmed − C2 ruled out: still 3 exposed cases, but a different three.
    expect(await run()).toBe(3);
    const after = caseSummarySchema
      .array()
      .parse((await as.physician.agent.get(`/api/cases?outcomeId=${c.outcomes.REV}&exposureGroupId=${c.groups.EXP}&status=confirmed`).expect(200)).body);
    expect(after.map((x) => x.caseRef).sort()).toEqual([ref(1), ref(3), ref(4)]);
    expect(after.every((x) => x.attribution.state === 'attributed')).toBe(true);
    // Confirming C5 as well: the next run counts 4.
    await as.physician.agent
      .post(`/api/cases/${ref(5)}/review`)
      .set('x-csrf-token', as.physician.csrf)
      .send({ decision: 'confirm', reason: 'Confirmed on retest' })
      .expect(200);
    expect(await run()).toBe(4);
  });

  it('reopens a decided case, and keeps every version with who, when and why', async () => {
    const reopened = caseReviewResultSchema.parse(
      (
        await as.physician.agent
          .post(`/api/cases/${ref(2)}/review`)
          .set('x-csrf-token', as.physician.csrf)
          .send({ decision: 'reopen', reason: 'New audiogram received; to be assessed again' })
          .expect(200)
      ).body,
    );
    expect(reopened.case.history.map((v) => v.status)).toEqual(['confirmed', 'ruled_out', 'suspected']);
    expect(reopened.case.history.filter((v) => v.current)).toHaveLength(1);
    const detail = caseDetailSchema.parse((await as.physician.agent.get(`/api/cases/${ref(2)}`).expect(200)).body);
    expect(detail.history.map((v) => v.review?.reason ?? null)).toEqual([
      null,
      'Shift explained by otitis media at the time of the test',
      'New audiogram received; to be assessed again',
    ]);
    await as.safety.agent.get(`/api/cases/${ref(2)}`).expect(403);
    await as.physician.agent.get('/api/cases/NO-SUCH-CASE').expect(404);
  });

  it("the export is the physician's, and the audit entry records how many cases left", async () => {
    await as.hygienist.agent.get('/api/cases/export').expect(403);
    const res = await as.physician.agent.get(`/api/cases/export?outcomeId=${c.outcomes.REV}&status=confirmed`).expect(200);
    // C1, C3, C4, C5 of the exposed group and C6 of the reference group.
    expect(res.body).toHaveLength(5);
    const [entry] = (await ds.query(`SELECT detail FROM audit_events WHERE action = 'cases.export' ORDER BY id DESC LIMIT 1`)) as Array<{
      detail: { cases: number; filters: Record<string, unknown> };
    }>;
    expect(entry!.detail).toMatchObject({ cases: 5, filters: { outcomeId: c.outcomes.REV, status: 'confirmed' } });
  });

  it('the administrator reads those audit entries without the counts, the search text or the reasons', async () => {
    // 3 is below the small-count threshold (5): an export of three cases.
    const three = await as.physician.agent
      .get(`/api/cases/export?q=${c.tag}-C&status=confirmed&exposureGroupId=${c.groups.EXP}&from=2031-05&to=2031-05`)
      .expect(200);
    expect(three.body.length).toBeLessThan(5);
    expect(three.body.length).toBeGreaterThan(0);
    const [stored] = (await ds.query(`SELECT detail FROM audit_events WHERE action = 'cases.export' ORDER BY id DESC LIMIT 1`)) as Array<{
      detail: Record<string, unknown>;
    }>;
    expect(stored!.detail.cases).toBe(three.body.length);
    const audit = auditEventSchema
      .array()
      .parse((await as.admin.agent.get('/api/admin/audit').query({ action: 'case', limit: 1000 }).expect(200)).body)
      .filter((e) => Number(e.id) > auditFrom);
    const exports = audit.filter((e) => e.action === 'cases.export');
    expect(exports.length).toBe(2);
    for (const e of exports) {
      expect(e.detail).not.toHaveProperty('cases');
      expect(e.detail).toMatchObject({ filters: expect.any(Object) });
    }
    const text = JSON.stringify(audit);
    expect(text).not.toContain(c.tag);
    expect(text).not.toContain('otitis');
    expect(audit.filter((e) => e.action === 'case.review')).toHaveLength(4);
  });
});

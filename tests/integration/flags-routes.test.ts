import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createApp } from '@ratewarden/api/app';
import { flagSchema } from '@ratewarden/shared/flags';
import { runDiffSchema, runSummarySchema } from '@ratewarden/shared/runs';
import { applyVerdicts } from '@ratewarden/worker/flags/apply-verdicts';
import { performRun } from '@ratewarden/worker/runs/perform-run';
import { provisionUser, signIn, type SignedInAgent } from '../support/sign-in';
import { testApiConfig } from '../support/test-config';
import { allSiteIds, openTestDataSource } from '../support/test-db';
import { clearCohortData, makeCohort, settings, type Cohort } from './runs-fixture';

/** The runs, rules, flags and mailbox routes with signed-in demo people: who may do what. */
describe('runs, rules and flags through the API', () => {
  let ds: DataSource;
  let c: Cohort;
  let app: ReturnType<typeof createApp>;
  let as: Record<'safety' | 'physician' | 'hygienist' | 'admin', SignedInAgent>;
  let flagId: string;
  const runs: string[] = [];

  beforeAll(async () => {
    ds = await openTestDataSource();
    await clearCohortData(ds);
    c = await makeCohort(ds, {
      groups: [
        ['REF', 0],
        ['EXP', 1],
      ],
      reference: 'REF',
      outcomes: [['API', 'recurrent']],
    });
    const rows: Array<[number, string, number, number, number]> = [];
    const exposed: number[] = [];
    for (let i = 0; i < 4; i++) {
      const e = await c.worker(`e${i}`, 1985, 'M');
      const r = await c.worker(`r${i}`, 1985, 'F');
      exposed.push(e);
      rows.push([e, '2031-05-01', c.sites[0]!, c.groups.EXP!, 160], [r, '2031-05-01', c.sites[0]!, c.groups.REF!, 160]);
    }
    await c.roster(rows);
    await c.cases(exposed.map((w) => [w, c.outcomes.API!, '2031-05-07'] as [number, number, string]));
    // Company flags and their figures are for readers of every site; other test files' sites exist too.
    const allSites = await allSiteIds(ds);
    await provisionUser(ds, 'safety@demo.ratewarden.test', 'safety_manager', allSites);
    await provisionUser(ds, 'physician@demo.ratewarden.test', 'physician', allSites);
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', allSites);
    await provisionUser(ds, 'admin@demo.ratewarden.test', 'administrator');
    app = createApp({ dataSource: ds, config: testApiConfig() });
    as = {
      safety: await signIn(app, 'safety@demo.ratewarden.test'),
      physician: await signIn(app, 'physician@demo.ratewarden.test'),
      hygienist: await signIn(app, 'hygienist@demo.ratewarden.test'),
      admin: await signIn(app, 'admin@demo.ratewarden.test'),
    };
  });
  afterAll(async () => {
    await ds.destroy();
  });

  it('validates a watch rule with zod and names the field at fault', async () => {
    const bad = await as.safety.agent
      .post('/api/rules')
      .set('x-csrf-token', as.safety.csrf)
      .send({ name: 'no threshold', outcomeId: c.outcomes.API, measure: 'irr' })
      .expect(422);
    expect(bad.body.details).toEqual(expect.arrayContaining([expect.objectContaining({ path: 'threshold' })]));
    const uchartYear = await as.safety.agent
      .post('/api/rules')
      .set('x-csrf-token', as.safety.csrf)
      .send({ name: 'u', outcomeId: c.outcomes.API, measure: 'uchart', window: 'rolling12' })
      .expect(422);
    expect(uchartYear.body.details).toEqual(expect.arrayContaining([expect.objectContaining({ path: 'window' })]));
    await as.physician.agent
      .post('/api/rules')
      .set('x-csrf-token', as.physician.csrf)
      .send({ name: 'x', outcomeId: c.outcomes.API, measure: 'rate', threshold: 1 })
      .expect(403);
    const ok = await as.safety.agent
      .post('/api/rules')
      .set('x-csrf-token', as.safety.csrf)
      .send({
        name: 'API rate rule',
        outcomeId: c.outcomes.API,
        exposureGroupId: c.groups.EXP,
        measure: 'rate',
        thresholdOn: 'estimate',
        threshold: 1,
        window: 'month',
        fdrControl: false,
      })
      .expect(201);
    expect(ok.body).toMatchObject({ fdrLevel: 0.05, consecutivePeriods: 1, recipients: [], minCases: 5 });
    // As a rule stored before minimum case counts were raised to the small-cell threshold: runs
    // evaluate it at the threshold, and on shown counts only, so 4 cases raise no flag.
    await ds.query(`UPDATE watch_rules SET min_cases = 2 WHERE id = $1`, [ok.body.id]);
    for (let i = 0; i < 2; i++) {
      const o = await performRun(ds, { trigger: 'cli', settings, appUrl: 'http://127.0.0.1:3000/' });
      runs.push((o as { runId: string }).runId);
    }
    expect(await ds.query(`SELECT id FROM flags WHERE rule_id = $1`, [ok.body.id])).toEqual([]);
    // A flag raised on those 4 cases by a run before that change: what each role reads of it.
    await ds.transaction((em) =>
      applyVerdicts(
        em,
        runs[1]!,
        settings,
        'http://127.0.0.1:3000/',
        new Map([
          [ok.body.id, { id: ok.body.id, name: 'API rate rule', measure: 'rate', thresholdOn: 'estimate', threshold: 1, windowKind: 'month', recipients: [] }],
        ]),
        [
          {
            ruleId: ok.body.id,
            outcomeId: c.outcomes.API!,
            exposureGroupId: c.groups.EXP!,
            siteId: null,
            completeness: 'complete',
            crossing: true,
            period: '2031-05-01',
            value: 12_500,
            estimate: 12_500,
            lower: 3406,
            upper: 32_004,
            cases: 4,
            expected: null,
            personTime: 0.32,
            p: null,
            q: null,
          },
        ],
      ),
    );
    const [flag] = (await ds.query(`SELECT id FROM flags WHERE rule_id = $1`, [ok.body.id])) as Array<{ id: string }>;
    flagId = flag!.id;
  });

  it('lists runs and the difference between two runs', async () => {
    const list = await as.hygienist.agent.get('/api/runs').expect(200);
    expect(
      runSummarySchema
        .array()
        .parse(list.body)
        .find((r) => r.id === runs[1]),
    ).toMatchObject({ state: 'succeeded' });
    // The safety manager sees the cohort's sites only (other files' sites exist too): site rows.
    const diff = await as.safety.agent.get(`/api/runs/diff?from=${runs[0]}&to=${runs[1]}&siteId=${c.sites[0]}`).expect(200);
    expect(runDiffSchema.parse(diff.body).unchangedCount).toBeGreaterThan(0);
    const results = await as.safety.agent.get(`/api/runs/${runs[1]}/results?outcomeId=${c.outcomes.API}&window=month&siteId=${c.sites[0]}`).expect(200);
    // 4 cases is under the small-cell threshold (5): suppressed for the safety manager, not for the physician.
    expect(results.body.find((r: { exposureGroupId: number }) => r.exposureGroupId === c.groups.EXP)).toMatchObject({
      cases: null,
      suppressed: true,
      hours: '640.00',
    });
    const own = await as.physician.agent.get(`/api/runs/${runs[1]}/results?outcomeId=${c.outcomes.API}&window=month&siteId=${c.sites[0]}`).expect(200);
    expect(own.body.find((r: { exposureGroupId: number }) => r.exposureGroupId === c.groups.EXP)).toMatchObject({ cases: 4, hours: '640.00' });
  });

  it("the run button is the hygienist's and leaves a request for the worker", async () => {
    await as.safety.agent.post('/api/runs').set('x-csrf-token', as.safety.csrf).expect(403);
    const res = await as.hygienist.agent.post('/api/runs').set('x-csrf-token', as.hygienist.csrf).expect(202);
    const [req] = (await ds.query(`SELECT reason, picked_at FROM run_requests WHERE id::text = $1`, [res.body.requestId])) as Array<{
      reason: string;
      picked_at: Date | null;
    }>;
    expect(req).toEqual({ reason: 'run requested by hygienist@demo.ratewarden.test', picked_at: null });
  });

  it("withholds a flag's small count and the figures that give it back, except from the physician", async () => {
    // 4 cases over 0.32 person-years: the rate (4 / 0.32 × 1,000 = 12,500) with the person-time shown would give 4 back.
    const safety = flagSchema.parse((await as.safety.agent.get(`/api/flags/${flagId}`).expect(200)).body);
    // A month of a group with small months: single months are withheld ('months', see disclosure-frame.ts), and the flag's figures with them.
    expect(safety.figures).toMatchObject({ suppressed: true, withheld: 'months', cases: null, value: null, estimate: null, lower: null, upper: null, p: null });
    expect(safety.value).toBeNull();
    expect(safety.worstValue).toBeNull();
    expect(safety.figures.personTime).toBeCloseTo(0.32, 12);
    const listed = flagSchema
      .array()
      .parse((await as.safety.agent.get('/api/flags').expect(200)).body)
      .find((f) => f.id === flagId)!;
    expect(listed).toMatchObject({ value: null, figures: { suppressed: true, cases: null } });
    const detail = (await as.hygienist.agent.get(`/api/flags/${flagId}`).expect(200)).body as { events: Array<{ detail: Record<string, unknown> }> };
    for (const e of detail.events) expect(e.detail).not.toHaveProperty('value');
    const physician = flagSchema.parse((await as.physician.agent.get(`/api/flags/${flagId}`).expect(200)).body);
    expect(physician.figures).toMatchObject({ suppressed: false, cases: 4 });
    expect(physician.value).toBeCloseTo(12_500, 6);
  });

  it('cases behind a flag: physician only, and audited', async () => {
    const list = await as.safety.agent.get('/api/flags').expect(200);
    expect(
      flagSchema
        .array()
        .parse(list.body)
        .map((f) => f.id),
    ).toContain(flagId);
    await as.safety.agent.get(`/api/flags/${flagId}/cases`).expect(403);
    await as.hygienist.agent.get(`/api/flags/${flagId}/cases`).expect(403);
    const cases = await as.physician.agent.get(`/api/flags/${flagId}/cases`).expect(200);
    expect(cases.body.length).toBe(4);
    const audits = (await ds.query(`SELECT actor_label FROM audit_events WHERE action = 'cases.read' AND target = $1`, [`flag:${flagId}`])) as Array<{
      actor_label: string;
    }>;
    expect(audits.map((a) => a.actor_label)).toEqual(['physician@demo.ratewarden.test']);
  });

  it("review and close are the safety manager's; a close needs a reason", async () => {
    await as.hygienist.agent.post(`/api/flags/${flagId}/review`).set('x-csrf-token', as.hygienist.csrf).send({}).expect(403);
    await as.safety.agent.post(`/api/flags/${flagId}/review`).set('x-csrf-token', as.safety.csrf).send({ comment: 'checking the roster' }).expect(200);
    await as.safety.agent.post(`/api/flags/${flagId}/close`).set('x-csrf-token', as.safety.csrf).send({ reason: 'because', comment: 'x' }).expect(422);
    const closed = await as.safety.agent
      .post(`/api/flags/${flagId}/close`)
      .set('x-csrf-token', as.safety.csrf)
      .send({ reason: 'action_taken', comment: 'extraction fixed' })
      .expect(200);
    expect(closed.body).toMatchObject({ state: 'closed', closeReason: 'action_taken', closeComment: 'extraction fixed' });
    expect(closed.body.events.map((e: { kind: string }) => e.kind)).toEqual(['raised', 'review_started', 'closed']);
  });

  it('clinical notes on a flag: written and read by the physician only, kept as written, the reads audited without the text', async () => {
    for (const who of ['safety', 'hygienist', 'admin'] as const) {
      await as[who].agent.get(`/api/flags/${flagId}/notes`).expect(403);
      await as[who].agent.post(`/api/flags/${flagId}/notes`).set('x-csrf-token', as[who].csrf).send({ text: 'x' }).expect(403);
    }
    await as.physician.agent.post(`/api/flags/${flagId}/notes`).set('x-csrf-token', as.physician.csrf).send({ text: '  ' }).expect(422);
    await as.physician.agent
      .post(`/api/flags/${flagId}/notes`)
      .set('x-csrf-token', as.physician.csrf)
      .send({ text: 'Two of the four had prior hearing loss at hire.' })
      .expect(201);
    const notes = await as.physician.agent
      .post(`/api/flags/${flagId}/notes`)
      .set('x-csrf-token', as.physician.csrf)
      .send({ text: 'Asked for the hire audiograms.' })
      .expect(201);
    expect(notes.body.map((n: { text: string; author: string }) => [n.text, n.author])).toEqual([
      ['Two of the four had prior hearing loss at hire.', 'physician@demo.ratewarden.test'],
      ['Asked for the hire audiograms.', 'physician@demo.ratewarden.test'],
    ]);
    expect((await as.physician.agent.get(`/api/flags/${flagId}/notes`).expect(200)).body).toHaveLength(2);
    // Nobody else reads them through the flag either.
    for (const who of ['safety', 'hygienist'] as const)
      expect(JSON.stringify((await as[who].agent.get(`/api/flags/${flagId}`).expect(200)).body)).not.toContain('hearing loss');
    await expect(ds.query(`UPDATE flag_notes SET text = 'changed'`)).rejects.toThrow(/kept as written/);
    await expect(ds.query(`DELETE FROM flag_notes`)).rejects.toThrow(/kept as written/);
    const audit = (await ds.query(`SELECT action, detail FROM audit_events WHERE target = $1 AND action IN ('cases.read', 'flag.clinical_note') ORDER BY id`, [
      `flag:${flagId}`,
    ])) as Array<{ action: string; detail: unknown }>;
    expect(audit.filter((a) => a.action === 'flag.clinical_note')).toHaveLength(2);
    expect(audit.filter((a) => a.action === 'cases.read' && JSON.stringify(a.detail).includes('clinical notes'))).toHaveLength(3);
    expect(JSON.stringify(audit)).not.toContain('hearing');
  });

  it("the development mailbox is the administrator's", async () => {
    await as.safety.agent.get('/api/mailbox').expect(403);
    const res = await as.admin.agent.get('/api/mailbox').expect(200);
    expect(Array.isArray(res.body)).toBe(true);
  });
});

import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createApp } from '@ratewarden/api/app';
import { flagDetailSchema, flagSchema } from '@ratewarden/shared/flags';
import { watchRuleSchema } from '@ratewarden/shared/rules';
import { createTransport, sendDueNotices } from '@ratewarden/worker/notices/notice-sender';
import { performRun } from '@ratewarden/worker/runs/perform-run';
import { startFakeSmtp, type FakeSmtp } from '@ratewarden/worker/smtp-fake/fake-smtp-server';
import { keepInMailbox } from '@ratewarden/worker/smtp-fake/keep-in-mailbox';
import { freePort } from '../support/free-port';
import { provisionUser, signIn, type SignedInAgent } from '../support/sign-in';
import { testApiConfig } from '../support/test-config';
import { allSiteIds, openTestDataSource } from '../support/test-db';
import { testSender } from './notices-fixture';
import { clearCohortData, settings, type Cohort } from './runs-fixture';
import { siteExcessCohort } from './site-excess-cohort';

/**
 * Site-level watch rules, who sees their flags, and follow-up notices, on the cohort of
 * site-excess-cohort.ts (its figures and their sources are given there): the company-wide rule
 * misses site one's excess; the same rule on sites one and two finds it at site one.
 */
describe('site-level watch rules, their readers, and follow-up notices', () => {
  let ds: DataSource;
  let c: Cohort;
  let app: ReturnType<typeof createApp>;
  let as: Record<'twoSites' | 'siteTwo' | 'hygienist' | 'physician', SignedInAgent>;
  let siteRuleId: string;
  let siteFlagId: string;
  let companyRateFlagId: string;
  const exp: number[] = [];
  const ref: number[] = [];
  const recipient = `site-watch-${Date.now()}@kestrelmoor.test`;
  let smtp: FakeSmtp;
  let port: number;

  const run = async () => {
    const o = await performRun(ds, { trigger: 'cli', settings, appUrl: 'http://127.0.0.1:3000' });
    expect(o.status).toBe('succeeded');
    return (o as { runId: string }).runId;
  };
  const write = (who: SignedInAgent, path: string, body: object) => who.agent.post(path).set('x-csrf-token', who.csrf).send(body);
  const flagsOf = async (ruleId: string) =>
    (await ds.query(`SELECT id, site_id, exposure_group_id, state, value, worst_value, crossing FROM flags WHERE rule_id = $1 ORDER BY raised_at`, [
      ruleId,
    ])) as Array<Record<string, any>>;
  const eventsOf = async (flagId: string) =>
    ((await ds.query(`SELECT kind FROM flag_events WHERE flag_id = $1 ORDER BY id`, [flagId])) as Array<{ kind: string }>).map((e) => e.kind);
  /** The notices of one kind of event of a flag, by recipient. */
  const noticesOf = async (flagId: string, kind: string) =>
    (await ds.query(
      `SELECT n.recipient, n.subject, n.body FROM notices n JOIN flag_events e ON e.id = n.flag_event_id WHERE n.flag_id = $1 AND e.kind = $2 ORDER BY n.recipient`,
      [flagId, kind],
    )) as Array<{ recipient: string; subject: string; body: string }>;

  beforeAll(async () => {
    ds = await openTestDataSource();
    await clearCohortData(ds);
    const fx = await siteExcessCohort(ds, 2031);
    c = fx.cohort;
    exp.push(...fx.exp);
    ref.push(...fx.ref);
    const [one, two] = c.sites as [number, number];
    const allSites = await allSiteIds(ds);
    await provisionUser(ds, 'safety@demo.ratewarden.test', 'safety_manager', [one, two]);
    await provisionUser(ds, 'newcomer@demo.ratewarden.test', 'safety_manager', [two]);
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', allSites);
    await provisionUser(ds, 'physician@demo.ratewarden.test', 'physician', allSites);
    app = createApp({ dataSource: ds, config: testApiConfig() });
    as = {
      twoSites: await signIn(app, 'safety@demo.ratewarden.test'),
      siteTwo: await signIn(app, 'newcomer@demo.ratewarden.test'),
      hygienist: await signIn(app, 'hygienist@demo.ratewarden.test'),
      physician: await signIn(app, 'physician@demo.ratewarden.test'),
    };
    port = await freePort();
    smtp = await startFakeSmtp({ port, keep: (m) => keepInMailbox(ds, m) });
  });
  afterAll(async () => {
    await smtp?.close();
    await ds?.destroy();
  });

  const irrRule = { outcomeId: 0, measure: 'irr', thresholdOn: 'lower_bound', threshold: 1, minCases: 5, window: 'rolling12' };

  it('a person writes rules for their own sites only; a company-wide rule needs every site', async () => {
    const [one, two] = c.sites as [number, number];
    const body = { ...irrRule, outcomeId: c.outcomes.SKIN, name: 'Skin IRR, my sites', recipients: [recipient] };
    expect((await write(as.twoSites, '/api/rules', { ...body, siteIds: null }).expect(403)).body.message).toMatch(/every site/);
    expect((await write(as.siteTwo, '/api/rules', { ...body, siteIds: [one, two] }).expect(403)).body.message).toMatch(new RegExp(`site ${one}`));
    await write(as.twoSites, '/api/rules', { ...body, siteIds: [] }).expect(422);
    const created = watchRuleSchema.parse((await write(as.twoSites, '/api/rules', { ...body, siteIds: [two, one, two] }).expect(201)).body);
    expect(created.siteIds).toEqual([one, two]);
    siteRuleId = created.id;
    // The person of site two alone may neither change nor widen it.
    await as.siteTwo.agent.patch(`/api/rules/${siteRuleId}`).set('x-csrf-token', as.siteTwo.csrf).send({ name: 'taken over' }).expect(403);
    await as.twoSites.agent.patch(`/api/rules/${siteRuleId}`).set('x-csrf-token', as.twoSites.csrf).send({ siteIds: null }).expect(403);
    // The company-wide twin, and a company-wide rate rule that does flag, by a reader of every site.
    await write(as.hygienist, '/api/rules', { ...body, name: 'Skin IRR, company', recipients: [] }).expect(201);
    await write(as.hygienist, '/api/rules', {
      name: 'Skin rate, company',
      outcomeId: c.outcomes.SKIN,
      measure: 'rate',
      thresholdOn: 'estimate',
      threshold: 1,
      window: 'rolling12',
      fdrControl: false,
    }).expect(201);
  });

  it('raises a flag at the site with the excess, which the company-wide rule misses', async () => {
    const runId = await run();
    const [one] = c.sites as [number, number];
    const flags = await flagsOf(siteRuleId);
    expect(flags.map((f) => [f.site_id, f.exposure_group_id, f.state])).toEqual([[one, c.groups.EXP, 'raised']]);
    siteFlagId = flags[0]!.id;
    expect(flags[0]!.value).toBeCloseTo(1.4568, 3); // the exact lower bound (site-excess-cohort.ts)
    const [company] = (await ds.query(`SELECT id FROM watch_rules WHERE name = 'Skin IRR, company'`)) as Array<{ id: string }>;
    expect(await flagsOf(company!.id)).toEqual([]);
    const [rate] = (await ds.query(`SELECT f.id, f.site_id FROM flags f JOIN watch_rules r ON r.id = f.rule_id WHERE r.name = 'Skin rate, company'`)) as Array<{
      id: string;
      site_id: number | null;
    }>;
    expect(rate).toMatchObject({ site_id: null });
    companyRateFlagId = rate!.id;
    // Benjamini–Hochberg across EXP at both sites (family of two): q = 2 p for site one.
    const detail = flagDetailSchema.parse((await as.physician.agent.get(`/api/flags/${siteFlagId}`).expect(200)).body);
    expect(detail.figures.q).toBeCloseTo(Math.min(1, 2 * detail.figures.p!), 12);
    expect(detail.figures).toMatchObject({ runId, cases: 20, completeness: 'complete', period: '2031-12-01' });
  });

  it("the safety manager of both sites sees the site flag with that site's figures only, and no company flag", async () => {
    const [one] = c.sites as [number, number];
    const list = flagSchema.array().parse((await as.twoSites.agent.get('/api/flags').expect(200)).body);
    expect(list.map((f) => f.id)).toEqual([siteFlagId]);
    const f = flagDetailSchema.parse((await as.twoSites.agent.get(`/api/flags/${siteFlagId}`).expect(200)).body);
    expect(f).toMatchObject({ siteId: one, siteName: 'Run test site one', exposureGroupName: 'Group EXP' });
    // Site one's own count (20), not the company's (25).
    expect(f.figures).toMatchObject({ suppressed: false, cases: 20 });
    expect(f.figures.value).toBeCloseTo(1.4568, 3);
    expect(f.figures.personTime).toBeCloseTo(1.6, 12); // EXP at site one (the company's EXP: 6.4)
    await as.twoSites.agent.get(`/api/flags/${companyRateFlagId}`).expect(404);
    await write(as.twoSites, `/api/flags/${companyRateFlagId}/review`, {}).expect(404);
  });

  it('a safety manager without that site gets no flag, and cannot act on it', async () => {
    expect(flagSchema.array().parse((await as.siteTwo.agent.get('/api/flags').expect(200)).body)).toEqual([]);
    await as.siteTwo.agent.get(`/api/flags/${siteFlagId}`).expect(404);
    await write(as.siteTwo, `/api/flags/${siteFlagId}/review`, {}).expect(404);
    await write(as.siteTwo, `/api/flags/${siteFlagId}/close`, { reason: 'explained', comment: 'not mine' }).expect(404);
    expect((await ds.query(`SELECT state FROM flags WHERE id = $1`, [siteFlagId]))[0]).toEqual({ state: 'raised' });
    // A reader of every site sees both flags; the physician reads the site's cases only.
    const all = flagSchema.array().parse((await as.hygienist.agent.get('/api/flags').expect(200)).body);
    expect(all.map((x) => x.id).sort()).toEqual([siteFlagId, companyRateFlagId].sort());
    const cases = (await as.physician.agent.get(`/api/flags/${siteFlagId}/cases`).expect(200)).body as Array<{ siteId: number }>;
    expect(cases.length).toBe(20);
    expect(new Set(cases.map((x) => x.siteId))).toEqual(new Set([c.sites[0]]));
  });

  it('notices name the site and state the period and its completeness', async () => {
    const notices = await noticesOf(siteFlagId, 'raised');
    expect(notices.map((n) => n.recipient)).toEqual(['physician@demo.ratewarden.test', recipient].sort());
    for (const n of notices) {
      expect(n.subject).toBe('Ratewarden: watch rule "Skin IRR, my sites" raised a flag for Group EXP at Run test site one');
      expect(n.body).toContain('Period: 12 months ending Dec 2031, complete');
      expect(n.body).toContain(`Site: Run test site one (RA${c.tag}), on this site's own results`);
      expect(n.body).toContain('Cases in the group: 20');
    }
    const company = await noticesOf(companyRateFlagId, 'raised');
    expect(company[0]!.body).toContain('Scope: the whole company');
    expect(company[0]!.body).toContain('Period: 12 months ending Dec 2031, complete');
  });

  it('a follow-up goes out when a later run withdraws an escalation, and the worst value goes back', async () => {
    const skin = c.outcomes.SKIN!;
    const [before] = await flagsOf(siteRuleId);
    // Six more exposed cases at site one: the flag worsens.
    await c.cases(exp.slice(0, 6).map((w) => [w, skin, '2031-11-20'] as [number, number, string]));
    await run();
    const [worse] = await flagsOf(siteRuleId);
    expect(worse!.worst_value).toBeGreaterThan(before!.worst_value);
    expect(await eventsOf(siteFlagId)).toEqual(['raised', 'escalated']);
    expect((await noticesOf(siteFlagId, 'escalated')).map((n) => n.recipient)).toEqual(['physician@demo.ratewarden.test', recipient].sort());
    // Those six were ruled out after all: the next run is back where it was before the worsening.
    await ds.query(`UPDATE case_events SET status = 'ruled_out' WHERE intake_id = $1 AND worker_id = ANY($2::bigint[]) AND onset_date = '2031-11-20'`, [
      c.casesIntake,
      exp.slice(0, 6),
    ]);
    await run();
    const [eased] = await flagsOf(siteRuleId);
    expect(eased).toMatchObject({ crossing: true, state: 'raised' });
    expect(eased!.value).toBeCloseTo(before!.value, 12);
    expect(eased!.worst_value).toBeCloseTo(before!.worst_value, 12);
    expect(await eventsOf(siteFlagId)).toEqual(['raised', 'escalated', 'eased']);
    const followUps = await noticesOf(siteFlagId, 'eased');
    expect(followUps.map((n) => n.recipient)).toEqual(['physician@demo.ratewarden.test', recipient].sort());
    for (const n of followUps) {
      expect(n.subject).toBe('Ratewarden: watch rule "Skin IRR, my sites" follow-up, worsening withdrawn for Group EXP at Run test site one');
      expect(n.body).toContain('no longer supports the worsening reported earlier');
      expect(n.body).toContain('Period: 12 months ending Dec 2031, complete');
      expect(n.body).not.toContain('Outcome SKIN');
    }
    // The same figures again: nothing new.
    await run();
    expect(await eventsOf(siteFlagId)).toEqual(['raised', 'escalated', 'eased']);
  });

  it('a follow-up goes out when a later run drops the flag below its rule, and another when it is past it again', async () => {
    const skin = c.outcomes.SKIN!;
    // Ten more reference cases at site one: EXP 20 against REF 15, the lower bound under 1.
    await c.cases(ref.map((w) => [w, skin, '2031-12-15'] as [number, number, string]));
    await run();
    const [cleared] = await flagsOf(siteRuleId);
    expect(cleared).toMatchObject({ crossing: false, state: 'raised' });
    expect(await eventsOf(siteFlagId)).toEqual(['raised', 'escalated', 'eased', 'cleared']);
    const followUps = await noticesOf(siteFlagId, 'cleared');
    expect(followUps.map((n) => n.recipient)).toEqual(['physician@demo.ratewarden.test', recipient].sort());
    for (const n of followUps) {
      expect(n.subject).toContain('follow-up, no longer past the rule for Group EXP at Run test site one');
      expect(n.body).toContain('no longer past its watch rule');
      expect(n.body).toContain('Cases in the group: 20');
    }
    // The safety manager's page of the flag says so too.
    const f = flagDetailSchema.parse((await as.twoSites.agent.get(`/api/flags/${siteFlagId}`).expect(200)).body);
    expect(f.crossing).toBe(false);
    expect(f.events.map((e) => e.kind)).toEqual(['raised', 'escalated', 'eased', 'cleared']);

    // Those reference cases ruled out: past the rule again.
    await ds.query(`UPDATE case_events SET status = 'ruled_out' WHERE intake_id = $1 AND worker_id = ANY($2::bigint[]) AND onset_date = '2031-12-15'`, [
      c.casesIntake,
      ref,
    ]);
    await run();
    expect(await eventsOf(siteFlagId)).toEqual(['raised', 'escalated', 'eased', 'cleared', 'crossed_again']);
    expect((await noticesOf(siteFlagId, 'crossed_again')).map((n) => n.subject)).toEqual(
      Array(2).fill('Ratewarden: watch rule "Skin IRR, my sites" flag past the rule again for Group EXP at Run test site one'),
    );
  });

  it('the follow-ups leave through the same outbox, each once', async () => {
    const transport = createTransport(testSender(port));
    try {
      await sendDueNotices(ds, transport, testSender(port), 500);
      await sendDueNotices(ds, transport, testSender(port), 500);
    } finally {
      transport.close();
    }
    // Each e-mail links to its notice in the inbox, whose subject says what happened.
    const mails = (await ds.query(`SELECT subject, message_id FROM dev_mailbox WHERE $1 = ANY(rcpt_to) ORDER BY id`, [recipient])) as Array<{
      subject: string;
      message_id: string;
    }>;
    const notices = (await ds.query(`SELECT id, subject, mail_subject FROM notices WHERE recipient = $1`, [recipient])) as Array<{
      id: string;
      subject: string;
      mail_subject: string;
    }>;
    const noticeOfMail = (m: { message_id: string }) => notices.find((n) => m.message_id === `<notice-${n.id}@ratewarden.local>`)!;
    expect(mails.map((m) => m.subject)).toEqual(mails.map((m) => noticeOfMail(m).mail_subject));
    const subjects = mails.map((m) =>
      noticeOfMail(m)
        .subject.replace(/^Ratewarden: watch rule "Skin IRR, my sites" /, '')
        .replace(/ for Group EXP at Run test site one$/, ''),
    );
    expect(subjects.sort()).toEqual(
      ['raised a flag', 'flag worsened', 'follow-up, worsening withdrawn', 'follow-up, no longer past the rule', 'flag past the rule again'].sort(),
    );
    expect(mails.map((m) => m.subject).sort()).toEqual(
      [...Array(3).fill('Ratewarden: a new threshold notice for you'), ...Array(2).fill('Ratewarden: a follow-up notice for you')].sort(),
    );
    const states = (await ds.query(`SELECT DISTINCT state FROM notices WHERE flag_id = $1`, [siteFlagId])) as Array<{ state: string }>;
    expect(states).toEqual([{ state: 'sent' }]);
  });

  it('a roster without its case list: rules read the latest complete period, or with the partial setting say "partial"', async () => {
    const [one] = c.sites as [number, number];
    // January 2032's roster at site one, with no case list reporting it: that month is partial.
    await c.roster(
      [...exp, ...ref].map((w) => [w, '2032-01-01', one, exp.includes(w) ? c.groups.EXP! : c.groups.REF!, 160] as [number, string, number, number, number]),
    );
    await ds.query(`UPDATE intakes SET reports_through = '2031-12-01' WHERE id = $1`, [c.casesIntake]);
    const rateRule = (name: string) =>
      write(as.twoSites, '/api/rules', {
        name,
        outcomeId: c.outcomes.SKIN,
        siteIds: [one],
        measure: 'rate',
        thresholdOn: 'estimate',
        threshold: 1,
        window: 'rolling12',
        fdrControl: false,
      });
    const complete = watchRuleSchema.parse((await rateRule('Skin rate, site one').expect(201)).body);
    await run();
    const [onComplete] = (await ds.query(`SELECT id, to_char(period, 'YYYY-MM') AS period FROM flags WHERE rule_id = $1`, [complete.id])) as Array<{
      id: string;
      period: string;
    }>;
    expect(onComplete!.period).toBe('2031-12');
    for (const n of await noticesOf(onComplete!.id, 'raised')) expect(n.body).toContain('Period: 12 months ending Dec 2031, complete');

    const partial = watchRuleSchema.parse((await rateRule('Skin rate, site one, partial periods too').expect(201)).body);
    const o = await performRun(ds, { trigger: 'cli', settings, appUrl: 'http://127.0.0.1:3000', rulesOnPartialPeriods: true });
    expect(o.status).toBe('succeeded');
    const [onPartial] = (await ds.query(
      `SELECT id, to_char(period, 'YYYY-MM') AS period, detail->>'completeness' AS completeness FROM flags WHERE rule_id = $1`,
      [partial.id],
    )) as Array<{ id: string; period: string; completeness: string }>;
    expect(onPartial).toMatchObject({ period: '2032-01', completeness: 'partial' });
    const notices = await noticesOf(onPartial!.id, 'raised');
    expect(notices.map((n) => n.recipient)).toEqual(['physician@demo.ratewarden.test']); // the rule names no one else
    for (const n of notices)
      expect(n.body).toContain('Period: 12 months ending Jan 2032, partial (a roster or case list of the period was not in when the run read it)');
  });
});

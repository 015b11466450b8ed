import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createApp } from '@ratewarden/api/app';
import { noticeDetailSchema, noticeSummarySchema } from '@ratewarden/shared/notices';
import { provisionUser, signIn, type SignedInAgent } from '../support/sign-in';
import { testApiConfig } from '../support/test-config';
import { allSiteIds, openTestDataSource } from '../support/test-db';
import { noticeCohort, raiseNotices } from './notices-fixture';
import { clearCohortData, type Cohort } from './runs-fixture';

/** The notices inbox: each person reads the notices addressed to them, and only those; opening one marks it read. */
describe('the notices inbox', () => {
  let ds: DataSource;
  let c: Cohort;
  let app: ReturnType<typeof createApp>;
  let as: Record<'physician' | 'safety' | 'hygienist' | 'admin', SignedInAgent>;
  const safetyEmail = 'safety@demo.ratewarden.test';

  beforeAll(async () => {
    ds = await openTestDataSource();
    await clearCohortData(ds);
    const sites = await allSiteIds(ds);
    await provisionUser(ds, 'physician@demo.ratewarden.test', 'physician', sites);
    await provisionUser(ds, safetyEmail, 'safety_manager', sites);
    await provisionUser(ds, 'hygienist@demo.ratewarden.test', 'hygienist', sites);
    await provisionUser(ds, 'admin@demo.ratewarden.test', 'administrator');
    c = await noticeCohort(ds);
    // The rule's recipient is the safety manager; every physician is told of a company flag too.
    await raiseNotices(ds, c, `Noise rate (${c.tag})`, [safetyEmail]);
    app = createApp({ dataSource: ds, config: testApiConfig() });
    as = {
      physician: await signIn(app, 'physician@demo.ratewarden.test'),
      safety: await signIn(app, safetyEmail),
      hygienist: await signIn(app, 'hygienist@demo.ratewarden.test'),
      admin: await signIn(app, 'admin@demo.ratewarden.test'),
    };
  });
  afterAll(async () => {
    await ds.destroy();
  });

  it("lists each person's own notices with flag, period, completeness and state", async () => {
    const mine = noticeSummarySchema.array().parse((await as.physician.agent.get('/api/notices').expect(200)).body);
    expect(mine).toHaveLength(1);
    expect(mine[0]).toMatchObject({ kind: 'raised', period: '2031-03-01', completeness: 'complete', state: 'new', readAt: null });
    const [flag] = (await ds.query(`SELECT id FROM flags`)) as Array<{ id: string }>;
    expect(mine[0]!.flagId).toBe(flag!.id);
    const safety = noticeSummarySchema.array().parse((await as.safety.agent.get('/api/notices').expect(200)).body);
    expect(safety).toHaveLength(1);
    expect(safety[0]!.id).not.toBe(mine[0]!.id);
    // Nobody reads another's notices: the hygienist has none, and cannot open the physician's.
    expect((await as.hygienist.agent.get('/api/notices').expect(200)).body).toEqual([]);
    await as.hygienist.agent.post(`/api/notices/${mine[0]!.id}/open`).set('x-csrf-token', as.hygienist.csrf).expect(404);
    await as.safety.agent.post(`/api/notices/${mine[0]!.id}/open`).set('x-csrf-token', as.safety.csrf).expect(404);
    await as.admin.agent.get('/api/notices').expect(403);
    expect((await as.physician.agent.get('/api/notices?kind=cleared').expect(200)).body).toEqual([]);
    expect((await as.physician.agent.get(`/api/notices?flagId=${flag!.id}`).expect(200)).body).toHaveLength(1);
    await as.physician.agent.get('/api/notices?state=unknown').expect(422);
  });

  it('opening a notice shows its text and marks it read; it can be marked new again', async () => {
    const [n] = noticeSummarySchema.array().parse((await as.physician.agent.get('/api/notices?state=new').expect(200)).body);
    expect((await as.physician.agent.get('/api/notices/unread').expect(200)).body).toEqual({ unread: 1 });
    const opened = noticeDetailSchema.parse(
      (await as.physician.agent.post(`/api/notices/${n!.id}/open`).set('x-csrf-token', as.physician.csrf).expect(200)).body,
    );
    expect(opened.state).toBe('read');
    // The physician's notice has the figures (6 cases is not small).
    expect(opened.text).toContain('Cases in the group: 6');
    expect(opened.text).toContain('Period: month of Mar 2031, complete');
    expect((await as.physician.agent.get('/api/notices?state=new').expect(200)).body).toEqual([]);
    expect((await as.physician.agent.get('/api/notices?state=read').expect(200)).body).toHaveLength(1);
    expect((await as.physician.agent.get('/api/notices/unread').expect(200)).body).toEqual({ unread: 0 });
    // Opened again: the first reading's time stays.
    const again = noticeDetailSchema.parse(
      (await as.physician.agent.post(`/api/notices/${n!.id}/open`).set('x-csrf-token', as.physician.csrf).expect(200)).body,
    );
    expect(again.readAt).toBe(opened.readAt);
    const unread = noticeSummarySchema.parse(
      (await as.physician.agent.post(`/api/notices/${n!.id}/unread`).set('x-csrf-token', as.physician.csrf).expect(200)).body,
    );
    expect(unread.state).toBe('new');
  });

  it('the e-mail carries only the link to the notice', async () => {
    const rows = (await ds.query(`SELECT id, mail_subject, mail_body FROM notices`)) as Array<{ id: string; mail_subject: string; mail_body: string }>;
    for (const r of rows) {
      expect(r.mail_body).toContain(`/notices/${r.id}`);
      expect(`${r.mail_subject}\n${r.mail_body}`).not.toMatch(/Group EXP|Cases|Noise rate|Mar 2031/);
    }
  });
});

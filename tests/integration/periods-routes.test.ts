import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { createApp } from '@ratewarden/api/app';
import { periodCalendarSchema } from '@ratewarden/shared/period-calendar';
import { sitePeriodSchema } from '@ratewarden/shared/periods';
import { provisionUser, signIn, type SignedInAgent } from '../support/sign-in';
import { testApiConfig } from '../support/test-config';
import { allSiteIds, openTestDataSource } from '../support/test-db';
import { monthCohort, type MonthCohort } from './periods-fixture';
import { clearCohortData } from './runs-fixture';

/**
 * The reporting periods API per role: the calendar (site-scoped), the hygienist closing and
 * reopening months (refused with something missing unless forced with a reason; audited; a run
 * requested), nobody else closing, and a correction of a closed month shown as such.
 */
describe('reporting periods through the API', () => {
  let ds: DataSource;
  let app: ReturnType<typeof createApp>;
  let c: MonthCohort;
  const as = {} as Record<'safety' | 'physician' | 'admin' | 'narrow', SignedInAgent>;

  const calendar = async (who: SignedInAgent, query = 'from=2026-08&to=2026-10') =>
    periodCalendarSchema.parse((await who.agent.get(`/api/periods?${query}`).expect(200)).body);
  const cell = (cal: Awaited<ReturnType<typeof calendar>>, siteId: number, month: string) =>
    cal.periods.find((p) => p.siteId === siteId && p.month === `${month}-01`)!;
  const post = (who: SignedInAgent, action: 'close' | 'reopen', body: Record<string, unknown>) =>
    who.agent.post(`/api/periods/${action}`).set('x-csrf-token', who.csrf).send(body);
  const audit = async (action: string) =>
    (await ds.query(`SELECT actor_label, target, detail FROM audit_events WHERE action = $1 AND target LIKE $2 ORDER BY id`, [
      action,
      `period:%${c.tag}:%`,
    ])) as Array<{ actor_label: string; target: string; detail: Record<string, unknown> }>;
  const requests = async () =>
    ((await ds.query(`SELECT reason FROM run_requests WHERE reason LIKE $1 ORDER BY id`, [`month %${c.tag}%`])) as Array<{ reason: string }>).map(
      (r) => r.reason,
    );

  beforeAll(async () => {
    ds = await openTestDataSource();
    await clearCohortData(ds);
    app = createApp({ dataSource: ds, config: testApiConfig() });
    // Rosters Sep and Oct 2026 at both sites; the case list reports through Sep only.
    c = await monthCohort(ds, app, { historyMonths: ['2026-09', '2026-10'], withCases: false });
    await c.uploadCases([`${c.tag}-X1,${c.tag}-NE1,${c.codes.outcome},2026-09-03,confirmed`], '2026-09');
    await provisionUser(ds, 'safety@demo.ratewarden.test', 'safety_manager', [c.sites.north]);
    await provisionUser(ds, 'physician@demo.ratewarden.test', 'physician', await allSiteIds(ds));
    await provisionUser(ds, 'admin@demo.ratewarden.test', 'administrator', []);
    await provisionUser(ds, 'newcomer@demo.ratewarden.test', 'hygienist', [c.sites.north]);
    as.safety = await signIn(app, 'safety@demo.ratewarden.test');
    as.physician = await signIn(app, 'physician@demo.ratewarden.test');
    as.admin = await signIn(app, 'admin@demo.ratewarden.test');
    as.narrow = await signIn(app, 'newcomer@demo.ratewarden.test');
  });
  afterAll(async () => {
    await provisionUser(ds, 'newcomer@demo.ratewarden.test', null);
    await ds?.destroy();
  });

  it("shows every site × month of the reader with its state, and only the reader's sites", async () => {
    const all = await calendar(c.hygienist);
    expect(all.months).toEqual(['2026-08-01', '2026-09-01', '2026-10-01']);
    expect(all.sites.map((s) => s.id)).toEqual(expect.arrayContaining([c.sites.north, c.sites.south]));
    expect(cell(all, c.sites.north, '2026-08').state).toBe('awaiting');
    expect(cell(all, c.sites.north, '2026-09').state).toBe('ready');
    expect(cell(all, c.sites.south, '2026-10').state).toBe('hours_in');
    expect(all.periods).toHaveLength(all.sites.length * 3);

    const safety = await calendar(as.safety);
    expect(safety.sites.map((s) => s.id)).toEqual([c.sites.north]);
    expect(new Set(safety.periods.map((p) => p.siteId))).toEqual(new Set([c.sites.north]));
    expect(cell(await calendar(as.physician), c.sites.south, '2026-09').state).toBe('ready');
    await as.admin.agent.get('/api/periods').expect(403);
    // Without a range: the latest 18 months, ending at the latest month received.
    const latest = await calendar(c.hygienist, '');
    expect(latest.months).toHaveLength(18);
    expect(latest.to).toBe('2026-10-01');
  });

  it('lets the hygienist close a complete month: audited, a run requested, closed by whom and when', async () => {
    const res = await post(c.hygienist, 'close', { siteId: c.sites.north, month: '2026-09' }).expect(200);
    const closed = sitePeriodSchema.parse(res.body);
    const [me] = (await ds.query(`SELECT name FROM users WHERE email = 'hygienist@demo.ratewarden.test'`)) as Array<{ name: string }>;
    expect(closed).toMatchObject({ siteId: c.sites.north, month: '2026-09-01', state: 'closed', correctedAfterClose: false, closedBy: me!.name });
    expect(closed.closedAt).not.toBeNull();
    expect(cell(await calendar(c.hygienist), c.sites.north, '2026-09').state).toBe('closed');
    expect(cell(await calendar(c.hygienist), c.sites.south, '2026-09').state).toBe('ready');
    expect(await audit('period.close')).toEqual([
      { actor_label: 'hygienist@demo.ratewarden.test', target: `period:${c.codes.north}:2026-09`, detail: { state: 'ready', forced: false, reason: null } },
    ]);
    expect(await requests()).toEqual([`month closed: ${c.codes.north} 2026-09`]);
    const again = await post(c.hygienist, 'close', { siteId: c.sites.north, month: '2026-09' }).expect(409);
    expect(again.body.message).toMatch(/already closed/);
  });

  it('refuses to close a month whose case list is missing unless forced with a reason', async () => {
    const refused = await post(c.hygienist, 'close', { siteId: c.sites.south, month: '2026-10' }).expect(409);
    expect(refused.body.message).toMatch(/hours in, cases awaited/);
    expect(refused.body.details).toEqual({ state: 'hours_in' });
    await post(c.hygienist, 'close', { siteId: c.sites.south, month: '2026-10', force: true }).expect(422);
    const forced = await post(c.hygienist, 'close', {
      siteId: c.sites.south,
      month: '2026-10',
      force: true,
      reason: 'site shut for the month, no cases will come',
    }).expect(200);
    expect(forced.body.state).toBe('closed');
    expect((await audit('period.close')).at(-1)).toMatchObject({
      target: `period:${c.codes.south}:2026-10`,
      detail: { state: 'hours_in', forced: true, reason: 'site shut for the month, no cases will come' },
    });
    await post(c.hygienist, 'close', { siteId: c.sites.south, month: '2099-01', force: true, reason: 'not yet' }).expect(422);
  });

  it('lets no one else close or reopen, and a hygienist only at their own sites', async () => {
    for (const who of [as.safety, as.physician, as.admin]) {
      const res = await post(who, 'close', { siteId: c.sites.north, month: '2026-10', force: true, reason: 'trying' }).expect(403);
      expect(res.body.code).toBe('forbidden');
      await post(who, 'reopen', { siteId: c.sites.north, month: '2026-09', reason: 'trying' }).expect(403);
    }
    const other = await post(as.narrow, 'close', { siteId: c.sites.south, month: '2026-09' }).expect(403);
    expect(other.body.message).toMatch(/no access to site/);
    expect(cell(await calendar(c.hygienist), c.sites.south, '2026-09').state).toBe('ready');
  });

  it('reopens a closed month only with a reason, back to what was received', async () => {
    await post(c.hygienist, 'reopen', { siteId: c.sites.north, month: '2026-09' }).expect(422);
    await post(c.hygienist, 'reopen', { siteId: c.sites.north, month: '2026-08', reason: 'never closed' }).expect(409);
    const open = await post(c.hygienist, 'reopen', { siteId: c.sites.north, month: '2026-09', reason: 'a late case came in' }).expect(200);
    expect(open.body).toMatchObject({ state: 'ready', closedAt: null, closedBy: null });
    expect(await audit('period.reopen')).toEqual([
      { actor_label: 'hygienist@demo.ratewarden.test', target: `period:${c.codes.north}:2026-09`, detail: { reason: 'a late case came in' } },
    ]);
    expect(await requests()).toContain(`month reopened: ${c.codes.north} 2026-09`);
  });

  it('marks a closed month corrected when a roster correction of it is applied after closing', async () => {
    await post(c.hygienist, 'close', { siteId: c.sites.north, month: '2026-09', reason: 'reviewed' }).expect(200);
    expect(cell(await calendar(c.hygienist), c.sites.north, '2026-09').correctedAfterClose).toBe(false);
    // The corrected roster of North, Sep 2026: one worker fewer.
    const rows = Array.from(
      { length: 19 },
      (_, i) => `${c.tag}-NE${i + 1},${c.codes.north},${c.codes.exp},2026-09,150,${1970 + ((i + 1) % 30)},${(i + 1) % 2 ? 'F' : 'M'}`,
    ).concat(Array.from({ length: 20 }, (_, i) => `${c.tag}-NR${i},${c.codes.north},${c.codes.ref},2026-09,150,${1970 + (i % 30)},${i % 2 ? 'F' : 'M'}`));
    await c.uploadRoster(rows, `north-2026-09-corrected-${c.tag}.csv`);
    const cal = await calendar(c.hygienist);
    expect(cell(cal, c.sites.north, '2026-09')).toMatchObject({ state: 'closed', correctedAfterClose: true });
    expect(cell(cal, c.sites.south, '2026-09').correctedAfterClose).toBe(false);
    expect(cell(cal, c.sites.south, '2026-10')).toMatchObject({ state: 'closed', correctedAfterClose: false });
  });
});

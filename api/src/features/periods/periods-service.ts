import { In, type DataSource, type EntityManager } from 'typeorm';
import { PeriodClosureEntity, SiteEntity } from '@ratewarden/db/entities/index';
import { requestRun } from '@ratewarden/db/run-requests';
import { readSitePeriods } from '@ratewarden/db/reporting-periods';
import type { PeriodCalendar, PeriodCalendarQuery } from '@ratewarden/shared/period-calendar';
import { addMonths } from '@ratewarden/shared/months';
import { isCompleteState, periodStateLabels, type SitePeriod } from '@ratewarden/shared/periods';
import type { Principal } from '@ratewarden/shared/permissions';
import { recordAudit } from '../../audit/audit-log';
import { assertSites, siteScope, userOf } from '../../auth/authorize';
import { AppError } from '../../lib/app-error';

/** Months the calendar shows when not asked: the latest 18. */
export const CALENDAR_MONTHS = 18;

const currentMonth = (now: Date) => `${now.toISOString().slice(0, 7)}-01`;

const scopeIds = (p: Principal): number[] | null => {
  const scope = siteScope(p);
  return scope === 'all' ? null : scope;
};

const awaiting = (siteId: number, month: string): SitePeriod => ({
  siteId,
  month,
  state: 'awaiting',
  roster: false,
  correctedAfterClose: false,
  closedAt: null,
  closedBy: null,
});

/**
 * The calendar of the reader's sites × months: every cell's state (shared/src/periods.ts decides
 * it, db/src/reporting-periods.ts reads what was received), ending at the month asked for, else
 * at the latest month anything was received for those sites, else at the current month.
 */
export async function periodCalendar(ds: DataSource, principal: Principal, q: PeriodCalendarQuery, now = new Date()): Promise<PeriodCalendar> {
  const siteIds = scopeIds(principal);
  const sites: PeriodCalendar['sites'] = await ds.getRepository(SiteEntity).find({
    select: { id: true, code: true, name: true },
    where: siteIds === null ? {} : { id: In(siteIds) },
    order: { name: 'ASC', id: 'ASC' },
  });
  const received = await readSitePeriods(ds, { siteIds });
  const latest = received.filter((p) => p.state !== 'awaiting').reduce<string | null>((m, p) => (m === null || p.month > m ? p.month : m), null);
  const to = q.to ?? latest ?? currentMonth(now);
  const from = q.from ?? addMonths(to, -(CALENDAR_MONTHS - 1));
  const last = received.reduce<string | null>((m, p) => (m === null || p.month > m ? p.month : m), null);
  const known = last !== null && last >= to ? received : await readSitePeriods(ds, { siteIds, through: to });
  const byKey = new Map(known.map((p) => [`${p.siteId}|${p.month}`, p]));
  const months: string[] = [];
  for (let m = from; m <= to; m = addMonths(m, 1)) months.push(m);
  return {
    from,
    to,
    months,
    sites,
    periods: sites.flatMap((s) => months.map((m) => byKey.get(`${s.id}|${m}`) ?? awaiting(s.id, m))),
  };
}

/** One site × month as it stands, or null before anything was received for any site. */
async function periodOf(em: EntityManager, siteId: number, month: string): Promise<SitePeriod | null> {
  return (await readSitePeriods(em, { siteIds: [siteId], through: month })).find((p) => p.month === month) ?? null;
}

async function siteOf(em: EntityManager, principal: Principal, siteId: number): Promise<{ id: number; code: string; name: string }> {
  assertSites(principal, [siteId]);
  const site = await em.getRepository(SiteEntity).findOne({ select: { id: true, code: true, name: true }, where: { id: siteId } });
  if (!site) throw new AppError('not_found', 'no such site');
  return site;
}

/** Closing and reopening of one site × month wait for each other (the latest closure row decides). */
const lockPeriod = (em: EntityManager, siteId: number, month: string) =>
  em.query(`SELECT pg_advisory_xact_lock(hashtext('period_closures'), hashtext($1))`, [`${siteId}|${month}`]);

const monthText = (month: string) => month.slice(0, 7);

interface ChangeInput {
  siteId: number;
  /** First day of the month. */
  month: string;
  reason?: string;
}

/**
 * The hygienist closes a month of a site. A month with both roster and case list in closes
 * as it is; one with something missing is refused with what is missing, unless `force` (with a
 * reason): the hygienist then says the month is complete as received (a site without work that
 * month, say). A month still to come cannot be closed. Audited; requests a run, because the
 * periods' completeness changes what the results and the watch rules read.
 */
export async function closePeriod(
  ds: DataSource,
  principal: Principal,
  body: ChangeInput & { force: boolean },
  opts: { ip?: string; allowFutureMonths?: boolean; now?: Date } = {},
): Promise<SitePeriod> {
  const person = userOf({ principal });
  return ds.transaction(async (em) => {
    const site = await siteOf(em, principal, body.siteId);
    if (!opts.allowFutureMonths && body.month > currentMonth(opts.now ?? new Date()))
      throw new AppError('validation_failed', 'a month still to come cannot be closed');
    await lockPeriod(em, site.id, body.month);
    const before = await periodOf(em, site.id, body.month);
    if (!before) throw new AppError('validation_failed', `nothing has been received for any site up to ${monthText(body.month)}: there is no month to close`);
    if (before.state === 'closed') throw new AppError('conflict', `${site.name}, ${monthText(body.month)} is already closed`);
    if (!isCompleteState(before.state) && !body.force) {
      throw new AppError(
        'conflict',
        `${site.name}, ${monthText(body.month)}: ${periodStateLabels[before.state].toLowerCase()}. Close it when the roster and the case list are both in, or close it anyway with a reason if nothing more will come.`,
        { state: before.state },
      );
    }
    await em
      .getRepository(PeriodClosureEntity)
      .insert({ siteId: site.id, month: body.month, action: 'close', reason: body.reason ?? null, personId: person.id });
    await recordAudit(em, {
      actor: principal,
      action: 'period.close',
      target: `period:${site.code}:${monthText(body.month)}`,
      detail: { state: before.state, forced: !isCompleteState(before.state), reason: body.reason ?? null },
      ip: opts.ip,
    });
    await requestRun(em, `month closed: ${site.code} ${monthText(body.month)}`);
    return (await periodOf(em, site.id, body.month))!;
  });
}

/** The hygienist reopens a closed month, with a reason; audited, and a run is requested. */
export async function reopenPeriod(
  ds: DataSource,
  principal: Principal,
  body: ChangeInput & { reason: string },
  opts: { ip?: string } = {},
): Promise<SitePeriod> {
  const person = userOf({ principal });
  return ds.transaction(async (em) => {
    const site = await siteOf(em, principal, body.siteId);
    await lockPeriod(em, site.id, body.month);
    const before = await periodOf(em, site.id, body.month);
    if (before?.state !== 'closed') throw new AppError('conflict', `${site.name}, ${monthText(body.month)} is not closed`);
    await em.getRepository(PeriodClosureEntity).insert({ siteId: site.id, month: body.month, action: 'reopen', reason: body.reason, personId: person.id });
    await recordAudit(em, {
      actor: principal,
      action: 'period.reopen',
      target: `period:${site.code}:${monthText(body.month)}`,
      detail: { reason: body.reason },
      ip: opts.ip,
    });
    await requestRun(em, `month reopened: ${site.code} ${monthText(body.month)}`);
    return (await periodOf(em, site.id, body.month))!;
  });
}

import { Router } from 'express';
import type { DataSource } from 'typeorm';
import { closePeriodSchema, periodCalendarQuerySchema, reopenPeriodSchema } from '@ratewarden/shared/period-calendar';
import { authorize } from '../../auth/authorize';
import { versionsOf } from '../../lib/data-versions';
import { TaggedAnswers } from '../../lib/tagged-answers';
import { closePeriod, periodCalendar, reopenPeriod } from './periods-service';

export interface PeriodsRouterDeps {
  dataSource: DataSource;
  /** INTAKE_ALLOW_FUTURE_MONTHS: months still to come may be closed too. */
  allowFutureMonths: boolean;
  /** Bytes of calendars kept ready to send (default 8 MiB). */
  answerCacheBytes?: number;
}

/**
 * Reporting periods, mounted at /api/periods: the calendar of the reader's sites × months, and
 * the hygienist closing and reopening a month (site-scoped, audited).
 */
export function periodsRouter({ dataSource: ds, allowFutureMonths, answerCacheBytes = 8 * 1024 ** 2 }: PeriodsRouterDeps): Router {
  const router = Router();
  // The calendar reads sites, intakes, roster slices and closures: kept per reader by the periods
  // counter, which every write of those raises (lib/data-versions.ts), and by the current month
  // (the calendar of a company with nothing received ends there).
  const calendars = new TaggedAnswers('periods', answerCacheBytes);
  router.get('/', authorize('periods:read'), async (req, res) => {
    const query = periodCalendarQuerySchema.parse(req.query);
    const now = new Date();
    const { periods } = await versionsOf(ds, req);
    await calendars.send(req, res, [periods, now.toISOString().slice(0, 7)], () => periodCalendar(ds, req.principal!, query, now));
  });
  router.post('/close', authorize('periods:close'), async (req, res) => {
    res.json(await closePeriod(ds, req.principal!, closePeriodSchema.parse(req.body), { ip: req.ip, allowFutureMonths }));
  });
  router.post('/reopen', authorize('periods:close'), async (req, res) => {
    res.json(await reopenPeriod(ds, req.principal!, reopenPeriodSchema.parse(req.body), { ip: req.ip }));
  });
  return router;
}

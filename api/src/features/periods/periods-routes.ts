import { Router } from 'express';
import type { DataSource } from 'typeorm';
import { closePeriodSchema, periodCalendarQuerySchema, reopenPeriodSchema } from '@ratewarden/shared/period-calendar';
import { authorize } from '../../auth/authorize';
import { closePeriod, periodCalendar, reopenPeriod } from './periods-service';

export interface PeriodsRouterDeps {
  dataSource: DataSource;
  /** INTAKE_ALLOW_FUTURE_MONTHS: months still to come may be closed too. */
  allowFutureMonths: boolean;
}

/**
 * Reporting periods, mounted at /api/periods: the calendar of the reader's sites × months, and
 * the hygienist closing and reopening a month (site-scoped, audited).
 */
export function periodsRouter({ dataSource: ds, allowFutureMonths }: PeriodsRouterDeps): Router {
  const router = Router();
  router.get('/', authorize('periods:read'), async (req, res) => {
    res.json(await periodCalendar(ds, req.principal!, periodCalendarQuerySchema.parse(req.query)));
  });
  router.post('/close', authorize('periods:close'), async (req, res) => {
    res.json(await closePeriod(ds, req.principal!, closePeriodSchema.parse(req.body), { ip: req.ip, allowFutureMonths }));
  });
  router.post('/reopen', authorize('periods:close'), async (req, res) => {
    res.json(await reopenPeriod(ds, req.principal!, reopenPeriodSchema.parse(req.body), { ip: req.ip }));
  });
  return router;
}

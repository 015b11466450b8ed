import { z } from 'zod';
import { monthsBetween } from './months';
import { sitePeriodSchema } from './periods';

/** A month as people type it in a query or body: YYYY-MM, carried on as its first day. */
const monthSchema = z
  .string()
  .regex(/^[0-9]{4}-(0[1-9]|1[0-2])$/, 'a month, YYYY-MM')
  .transform((m) => `${m}-01`);

/** Query of GET /api/periods: the months shown (by default the latest 18 ending at the latest month received, or the current month). */
export const periodCalendarQuerySchema = z
  .object({ from: monthSchema.optional(), to: monthSchema.optional() })
  .refine((q) => !q.from || !q.to || q.from <= q.to, 'from must not be after to')
  .refine((q) => !q.from || !q.to || monthsBetween(q.from, q.to) < 120, 'at most 120 months at a time');
export type PeriodCalendarQuery = z.infer<typeof periodCalendarQuerySchema>;

/** GET /api/periods: the reader's sites × the months asked for, every cell present (`awaiting` when nothing came). */
export const periodCalendarSchema = z.object({
  from: z.string(),
  to: z.string(),
  /** First days of the months, oldest first. */
  months: z.array(z.string()),
  sites: z.array(z.object({ id: z.number().int(), code: z.string(), name: z.string() })),
  periods: z.array(sitePeriodSchema),
});
export type PeriodCalendar = z.infer<typeof periodCalendarSchema>;

const reasonSchema = z.string().trim().min(3, 'say why in a few words').max(500);

/**
 * POST /api/periods/close. A month whose roster or case list is missing is refused unless
 * `force` is set, and then a reason is needed (the month counts as complete from then on).
 */
export const closePeriodSchema = z
  .object({ siteId: z.number().int().positive(), month: monthSchema, reason: reasonSchema.optional(), force: z.boolean().default(false) })
  .strict()
  .refine((b) => !b.force || b.reason !== undefined, { message: 'closing a month with something missing needs a reason', path: ['reason'] });
export type ClosePeriodBody = z.input<typeof closePeriodSchema>;

/** POST /api/periods/reopen: a closed month back to what has been received; always with a reason. */
export const reopenPeriodSchema = z.object({ siteId: z.number().int().positive(), month: monthSchema, reason: reasonSchema }).strict();
export type ReopenPeriodBody = z.input<typeof reopenPeriodSchema>;

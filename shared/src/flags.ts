import { z } from 'zod';
import { ruleMeasureSchema, ruleWindowSchema, thresholdOnSchema } from './rules';
import { completenessSchema } from './periods';
import { withheldSchema } from './runs';

/** raised → in review → closed (with a reason). */
export const flagStateSchema = z.enum(['raised', 'in_review', 'closed']);
export type FlagState = z.infer<typeof flagStateSchema>;

export const closeReasonSchema = z.enum(['explained', 'action_taken', 'not_substantiated']);
export type CloseReason = z.infer<typeof closeReasonSchema>;

/**
 * What happened to a flag. By a run: raised, updated, escalated (past its worst: notices), eased
 * (an escalation withdrawn, the value back at or below its level before: follow-up notices),
 * cleared (no longer past the rule: follow-up notices), crossed_again (past the rule again after
 * being cleared: notices). By a person: review_started, closed.
 */
export const flagEventKindSchema = z.enum(['raised', 'updated', 'escalated', 'eased', 'cleared', 'crossed_again', 'review_started', 'closed']);
export type FlagEventKind = z.infer<typeof flagEventKindSchema>;

/**
 * The aggregate numbers behind a flag, as of its latest run (never case-level data). For every
 * role but the physician a small count is withheld with what gives it back (`suppressed`, then
 * cases, value, estimate, limits, expected, p and q are null).
 */
export const flagFiguresSchema = z.object({
  runId: z.string(),
  period: z.string(),
  window: ruleWindowSchema,
  measure: ruleMeasureSchema,
  thresholdOn: thresholdOnSchema,
  threshold: z.number().nullable(),
  value: z.number().nullable(),
  estimate: z.union([z.number(), z.string()]).nullable(),
  lower: z.union([z.number(), z.string()]).nullable(),
  upper: z.union([z.number(), z.string()]).nullable(),
  cases: z.number().int().nullable(),
  expected: z.number().nullable(),
  personTime: z.number(),
  p: z.number().nullable(),
  q: z.number().nullable(),
  personTimeBasis: z.string(),
  per: z.number(),
  /** Whether the period's window was built on complete reporting periods (absent on flags raised before periods existed). */
  completeness: completenessSchema.optional(),
  suppressed: z.boolean().optional(),
  /** Why the count is withheld (see small-cells.ts): small itself, or the complement of small site counts. */
  withheld: withheldSchema.nullable().optional(),
});
export type FlagFigures = z.infer<typeof flagFiguresSchema>;

export const flagSchema = z.object({
  id: z.string().uuid(),
  ruleId: z.string().uuid(),
  ruleName: z.string(),
  outcomeId: z.number().int(),
  exposureGroupId: z.number().int(),
  exposureGroupName: z.string(),
  /** The site whose own results crossed the rule; null: the whole company's. */
  siteId: z.number().int().nullable(),
  siteName: z.string().nullable(),
  state: flagStateSchema,
  closeReason: closeReasonSchema.nullable(),
  closeComment: z.string().nullable(),
  period: z.string(),
  /** The measure's value and its worst so far; null when withheld with a small count. */
  value: z.number().nullable(),
  worstValue: z.number().nullable(),
  crossing: z.boolean(),
  figures: flagFiguresSchema,
  raisedAt: z.string(),
  updatedAt: z.string(),
  closedAt: z.string().nullable(),
});
export type Flag = z.infer<typeof flagSchema>;

export const flagEventSchema = z.object({
  id: z.string(),
  at: z.string(),
  kind: flagEventKindSchema,
  actorId: z.string().nullable(),
  runId: z.string().nullable(),
  detail: z.record(z.string(), z.unknown()),
});
export type FlagEvent = z.infer<typeof flagEventSchema>;

export const noticeStateSchema = z.enum(['pending', 'sending', 'sent', 'failed']);
export const noticeSchema = z.object({
  id: z.string().uuid(),
  recipient: z.string(),
  state: noticeStateSchema,
  attempts: z.number().int(),
  lastError: z.string().nullable(),
  createdAt: z.string(),
  sentAt: z.string().nullable(),
});
export type Notice = z.infer<typeof noticeSchema>;

export const flagDetailSchema = flagSchema.extend({ events: z.array(flagEventSchema), notices: z.array(noticeSchema) });
export type FlagDetail = z.infer<typeof flagDetailSchema>;

export const flagListQuerySchema = z.object({
  state: flagStateSchema.optional(),
  outcomeId: z.coerce.number().int().positive().optional(),
  exposureGroupId: z.coerce.number().int().positive().optional(),
});

/** Body of POST /api/flags/:id/review. */
export const flagReviewInputSchema = z.strictObject({ comment: z.string().trim().max(2000).optional() });
/** Body of POST /api/flags/:id/close. */
export const flagCloseInputSchema = z.strictObject({ reason: closeReasonSchema, comment: z.string().trim().min(1).max(4000) });
export type FlagCloseInput = z.infer<typeof flagCloseInputSchema>;

/** One case behind a flag (GET /api/flags/:id/cases, physician only). */
export const flagCaseSchema = z.object({
  caseRef: z.string(),
  workerKey: z.string(),
  onsetDate: z.string(),
  status: z.string(),
  siteId: z.number().int(),
});
export type FlagCase = z.infer<typeof flagCaseSchema>;

/** One message kept by the development SMTP fake (GET /api/mailbox). */
export const mailboxMessageSchema = z.object({
  id: z.string(),
  receivedAt: z.string(),
  from: z.string().nullable(),
  to: z.array(z.string()),
  subject: z.string().nullable(),
  text: z.string().nullable(),
});
export type MailboxMessage = z.infer<typeof mailboxMessageSchema>;

/** A physician's clinical note on a flag (physicians only; kept as written). */
export const flagNoteSchema = z.object({ id: z.string(), text: z.string(), author: z.string(), createdAt: z.string() });
export type FlagNote = z.infer<typeof flagNoteSchema>;
export const flagNoteInputSchema = z.strictObject({ text: z.string().trim().min(1, 'write the note').max(4000) });

import { z } from 'zod';
import { completenessSchema } from './periods';

/**
 * The notices inbox: each signed-in person reads the threshold notices addressed to them (by
 * their e-mail address), as the run wrote them for them (a small count already withheld from
 * anyone but the physician). The e-mail only links here.
 */
export const noticeKindSchema = z.enum(['raised', 'escalated', 'eased', 'cleared', 'crossed_again']);
export type NoticeKind = z.infer<typeof noticeKindSchema>;

export const noticeReadStateSchema = z.enum(['new', 'read']);

export const noticeListQuerySchema = z.object({
  state: noticeReadStateSchema.optional(),
  kind: noticeKindSchema.optional(),
  flagId: z.string().uuid().optional(),
});
export type NoticeListQuery = z.infer<typeof noticeListQuerySchema>;

export const noticeSummarySchema = z.object({
  id: z.string().uuid(),
  flagId: z.string().uuid(),
  kind: noticeKindSchema.nullable(),
  subject: z.string(),
  /** The flag's period (first of the month) and whether it was complete when the run read it. */
  period: z.string().nullable(),
  completeness: completenessSchema.nullable(),
  state: noticeReadStateSchema,
  createdAt: z.string(),
  readAt: z.string().nullable(),
  /** Delivery of the e-mail that links here. */
  mailState: z.enum(['pending', 'sending', 'sent', 'failed']),
});
export type NoticeSummary = z.infer<typeof noticeSummarySchema>;

export const noticeDetailSchema = noticeSummarySchema.extend({ text: z.string() });
export type NoticeDetail = z.infer<typeof noticeDetailSchema>;

export const noticeCountSchema = z.object({ unread: z.number().int() });

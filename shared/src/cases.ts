import { z } from 'zod';
import { caseStatusSchema } from './intake';

/**
 * The physician's case register and case review (case-level data: `cases:read`, `cases:review`).
 * Every read is audited; none of this reaches any other role.
 */

/** What a physician decides on a case, and the status each decision leaves. */
export const caseDecisionSchema = z.enum(['confirm', 'rule_out', 'reopen']);
export type CaseDecision = z.infer<typeof caseDecisionSchema>;
export const decisionStatus = { confirm: 'confirmed', rule_out: 'ruled_out', reopen: 'suspected' } as const;

export const caseReviewInputSchema = z.strictObject({
  decision: caseDecisionSchema,
  reason: z.string().trim().min(3, 'say why, in a few words').max(2000),
});
export type CaseReviewInput = z.infer<typeof caseReviewInputSchema>;

const monthSchema = z
  .string()
  .regex(/^\d{4}-\d{2}(-01)?$/, 'a month, YYYY-MM')
  .transform((m) => `${m.slice(0, 7)}-01`);
const idParam = z.coerce.number().int().positive();

/** Filters of the register: all optional; `q` finds a case reference or a worker key (part of either). */
export const caseListQuerySchema = z.object({
  outcomeId: idParam.optional(),
  exposureGroupId: idParam.optional(),
  siteId: idParam.optional(),
  status: caseStatusSchema.optional(),
  from: monthSchema.optional(),
  to: monthSchema.optional(),
  q: z.string().trim().max(100).optional(),
  limit: z.coerce.number().int().min(1).max(5000).default(500),
});
export type CaseListQuery = z.infer<typeof caseListQuerySchema>;

/** How the current run saw a case: counted in a cell, counted but unattributed (why), or not counted. */
export const caseAttributionSchema = z.object({
  runId: z.string().uuid().nullable(),
  state: z.enum(['attributed', 'unattributed', 'not_counted', 'no_run']),
  reason: z.string().nullable(),
});
export type CaseAttribution = z.infer<typeof caseAttributionSchema>;

export const caseSummarySchema = z.object({
  caseRef: z.string(),
  workerKey: z.string(),
  outcomeId: z.number().int(),
  outcomeCode: z.string(),
  onsetDate: z.string(),
  status: caseStatusSchema,
  /** The site and exposure group the case is attributed to as a run would (onset month minus the lag); null when no roster row. */
  siteId: z.number().int().nullable(),
  exposureGroupId: z.number().int().nullable(),
  intakeId: z.string().uuid(),
  intakeFileName: z.string(),
  /** Whether the current version is a physician's decision. */
  reviewed: z.boolean(),
  versions: z.number().int(),
  attribution: caseAttributionSchema,
});
export type CaseSummary = z.infer<typeof caseSummarySchema>;

export const caseReviewSchema = z.object({
  id: z.string(),
  decision: caseDecisionSchema,
  fromStatus: caseStatusSchema,
  toStatus: caseStatusSchema,
  reason: z.string(),
  decidedBy: z.string(),
  decidedAt: z.string(),
});
export type CaseReview = z.infer<typeof caseReviewSchema>;

/** One version of a case: from a case list (its intake), or a physician's decision (its review). */
export const caseVersionSchema = z.object({
  id: z.string(),
  status: caseStatusSchema,
  onsetDate: z.string(),
  outcomeCode: z.string(),
  workerKey: z.string(),
  intakeId: z.string().uuid(),
  intakeFileName: z.string(),
  createdAt: z.string(),
  current: z.boolean(),
  review: caseReviewSchema.nullable(),
});
export type CaseVersion = z.infer<typeof caseVersionSchema>;

export const caseDetailSchema = caseSummarySchema.extend({ history: z.array(caseVersionSchema) });
export type CaseDetail = z.infer<typeof caseDetailSchema>;

export const caseReviewResultSchema = z.object({ case: caseDetailSchema, runRequestId: z.string() });
export type CaseReviewResult = z.infer<typeof caseReviewResultSchema>;

/** A case of a case list that contradicts a physician's decision, and its resolution. */
export const caseConflictResolutionSchema = z.enum(['keep', 'accept']);
export type CaseConflictResolution = z.infer<typeof caseConflictResolutionSchema>;
export const caseConflictSchema = z.object({
  caseRef: z.string(),
  workerKey: z.string(),
  onsetDate: z.string(),
  decidedStatus: caseStatusSchema,
  listStatus: caseStatusSchema,
  decision: caseReviewSchema,
  resolution: caseConflictResolutionSchema.nullable(),
  resolvedBy: z.string().nullable(),
  resolvedAt: z.string().nullable(),
});
export type CaseConflict = z.infer<typeof caseConflictSchema>;
export const caseConflictInputSchema = z.strictObject({ resolution: caseConflictResolutionSchema });

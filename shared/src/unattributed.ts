import { z } from 'zod';
import { caseStatusSchema } from './intake';
import { splitWithheldSchema } from './small-cells';

/**
 * Cases a run counts but no roster row attributes (worker/src/runs/cells-query.ts,
 * UNATTRIBUTED_SQL), and why, in Ratewarden's own reason codes.
 */
export const unattributedReasonSchema = z.enum(['no_roster_month', 'removed_by_correction', 'lag_outside_data']);
export type UnattributedReason = z.infer<typeof unattributedReasonSchema>;

export const UNATTRIBUTED_REASONS = unattributedReasonSchema.options;

/** Each reason in words, for every page that shows one. */
export const unattributedReasonText: Record<UnattributedReason, string> = {
  no_roster_month: 'the worker has no roster row with hours in the onset month (after the exposure lag)',
  removed_by_correction: 'a roster correction removed the worker from that month',
  lag_outside_data: 'the onset month, moved back by the exposure lag, falls outside the rostered months',
};

/** A count as its reader may see it: withheld (null, with the reason, splitSuppression) or shown. */
const shownCount = { count: z.number().int().nullable(), withheld: splitWithheldSchema.nullable() };

/** The unattributed cases of one outcome in a run: their number and its split by reason. */
export const unattributedCountSchema = z.object({
  outcomeId: z.number().int(),
  ...shownCount,
  reasons: z.array(z.object({ reason: unattributedReasonSchema, ...shownCount })),
});
export type UnattributedCount = z.infer<typeof unattributedCountSchema>;

/** One unattributed case, as the physician reads it (GET /api/runs/current/unattributed). */
export const unattributedCaseSchema = z.object({
  caseRef: z.string(),
  workerKey: z.string(),
  outcomeId: z.number().int(),
  onsetDate: z.string(),
  status: caseStatusSchema,
  reason: unattributedReasonSchema,
});
export type UnattributedCase = z.infer<typeof unattributedCaseSchema>;

export const unattributedListSchema = z.object({
  runId: z.string().uuid(),
  runNumber: z.number().int(),
  cases: z.array(unattributedCaseSchema),
});
export type UnattributedList = z.infer<typeof unattributedListSchema>;

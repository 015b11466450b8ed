import { z } from 'zod';
import { caseStatusSchema, intakeKindSchema, intakeStateSchema, type IntakeKind } from './intake';
import { cellJudge, isCalendarDate, NO_BOUNDS, type CellBounds } from './intake-cell';
import { intakeColumns, type ColumnDef } from './intake-columns';
import { splitWithheldSchema } from './small-cells';

export { isCalendarDate };

/** The zod schema of one cell, derived from the column's rule through the shared cell judge. */
export function cellSchema(col: ColumnDef, bounds: CellBounds = NO_BOUNDS): z.ZodType<string | number | null> {
  const judge = cellJudge(col, bounds);
  return z.string().transform((raw, ctx) => {
    const verdict = judge(raw);
    if (verdict.reason) {
      ctx.addIssue({ code: 'custom', message: verdict.reason });
      return verdict.value ?? z.NEVER;
    }
    return verdict.value;
  });
}

/**
 * Row schema for small files, the web page's preview and JSON bodies: header name → cell. Pass the
 * latest month the server takes in to refuse later months as the upload would.
 */
export function rowSchema(kind: IntakeKind, bounds: CellBounds = NO_BOUNDS) {
  const shape: Record<string, z.ZodType<string | number | null>> = {};
  for (const col of intakeColumns[kind])
    shape[col.name] = col.required
      ? cellSchema(col, bounds)
      : cellSchema(col, bounds)
          .optional()
          .transform((v) => v ?? null);
  return z.object(shape).strict();
}

// ---- API shapes -------------------------------------------------------------------------------

/** One problem found in a file: row/line and column, with a reason in the hygienist's words. */
export const intakeProblemSchema = z.object({
  /** Line of the file, the header being line 1 (null for problems of the file as a whole). */
  line: z.number().int().nullable(),
  column: z.string().nullable(),
  value: z.string().nullable(),
  reason: z.string(),
});
export type IntakeProblem = z.infer<typeof intakeProblemSchema>;

export const rosterSliceDiffSchema = z.object({
  siteCode: z.string(),
  month: z.string(),
  /** Whether a version of this site × month is already stored (false: the whole slice is new). */
  stored: z.boolean(),
  rows: z.number().int(),
  added: z.number().int(),
  removed: z.number().int(),
  moved: z.number().int(),
  hoursChanged: z.number().int(),
  unchanged: z.number().int(),
  storedHours: z.number(),
  newHours: z.number(),
  /**
   * The workers (pseudonymous keys, sorted) of each kind, the first ROSTER_DIFF_WORKER_CAP of
   * each; the counts above are whole. Empty for a new slice (every worker in it is added). Absent
   * from diffs stored before workers were named.
   */
  workers: z.object({ added: z.array(z.string()), removed: z.array(z.string()), moved: z.array(z.string()), hoursChanged: z.array(z.string()) }).optional(),
});
export type RosterSliceDiff = z.infer<typeof rosterSliceDiffSchema>;

/** How many worker keys of each kind a roster diff names per site × month. */
export const ROSTER_DIFF_WORKER_CAP = 200;

/** A stored current case that applying a roster would leave without a roster row (case-level: the physician's). */
export const orphanedCaseSchema = z.object({
  caseRef: z.string(),
  workerKey: z.string(),
  outcomeCode: z.string(),
  onsetDate: z.string(),
  status: caseStatusSchema,
  /** The site and month (YYYY-MM, the onset month minus the outcome's lag) whose row the case loses. */
  siteCode: z.string(),
  month: z.string(),
});
export type OrphanedCase = z.infer<typeof orphanedCaseSchema>;

/**
 * Stored cases the roster would orphan: the count (null, withheld 'small', when from 1 to the
 * threshold − 1 for anyone but the physician) and, for holders of `cases:read` only, the first 200.
 */
export const orphanedCasesSchema = z.object({
  count: z.number().int().nullable(),
  withheld: z.literal('small').nullable(),
  cases: z.array(orphanedCaseSchema).optional(),
});
export type OrphanedCases = z.infer<typeof orphanedCasesSchema>;

export const rosterDiffSchema = z.object({
  kind: z.literal('roster'),
  newWorkers: z.number().int(),
  slices: z.array(rosterSliceDiffSchema),
  totals: z.object({
    added: z.number().int(),
    removed: z.number().int(),
    moved: z.number().int(),
    hoursChanged: z.number().int(),
    unchanged: z.number().int(),
    newSlices: z.number().int(),
    replacedSlices: z.number().int(),
  }),
  /** Absent from diffs stored before orphaned cases were looked for. */
  orphanedCases: orphanedCasesSchema.optional(),
});

/** A count of new or changed cases as its reader may see it (nestedSuppression, shared/src/small-cells.ts). */
const diffCount = z.object({ count: z.number().int().nullable(), withheld: splitWithheldSchema.nullable() });

/** New and changed cases of one outcome × status × exposure group (the new version's). */
export const caseDiffCellSchema = z.object({
  outcomeCode: z.string(),
  status: caseStatusSchema,
  /** Code of the exposure group of the roster row that attributes the case (onset month minus the lag); null: not rostered. */
  groupCode: z.string().nullable(),
  new: diffCount,
  changed: diffCount,
});
export type CaseDiffCell = z.infer<typeof caseDiffCellSchema>;

/**
 * What applying a case list changes. The totals are the file's own; per outcome and in the split,
 * counts from 1 to the threshold − 1 are withheld for anyone but the physician, with the counts
 * that would give them back (the split is absent from diffs stored before it existed).
 */
export const caseDiffSchema = z.object({
  kind: z.literal('cases'),
  new: z.number().int(),
  changed: z.number().int(),
  unchanged: z.number().int(),
  byOutcome: z.array(
    z.object({
      outcomeCode: z.string(),
      new: z.number().int().nullable(),
      changed: z.number().int().nullable(),
      newWithheld: splitWithheldSchema.nullable().optional(),
      changedWithheld: splitWithheldSchema.nullable().optional(),
    }),
  ),
  split: z.array(caseDiffCellSchema).optional(),
});

export const intakeDiffSchema = z.discriminatedUnion('kind', [rosterDiffSchema, caseDiffSchema]);
export type IntakeDiff = z.infer<typeof intakeDiffSchema>;

export const intakeSummarySchema = z.object({
  id: z.string().uuid(),
  kind: intakeKindSchema,
  state: intakeStateSchema,
  fileName: z.string(),
  checksum: z.string(),
  sizeBytes: z.number().int(),
  siteIds: z.array(z.number().int()),
  monthFrom: z.string().nullable(),
  monthTo: z.string().nullable(),
  rowCount: z.number().int(),
  problemCount: z.number().int(),
  submittedBy: z.string().nullable(),
  createdAt: z.string(),
  checkedAt: z.string().nullable(),
  appliedAt: z.string().nullable(),
  supersededAt: z.string().nullable(),
  /** Whether staged rows are waiting for apply (state checked). */
  staged: z.boolean(),
});
export type IntakeSummary = z.infer<typeof intakeSummarySchema>;

export const runRequestSchema = z.object({
  id: z.number().int(),
  requestedAt: z.string(),
  pickedAt: z.string().nullable(),
  reason: z.string(),
  /** The run that took the request up, once one has. */
  run: z.object({ id: z.string(), number: z.number().int(), state: z.enum(['running', 'succeeded', 'failed']), finishedAt: z.string().nullable() }).nullable(),
});

export const intakeDetailSchema = intakeSummarySchema.extend({
  /** The first 1,000 problems, ordered by line; `problemCount` counts them all. */
  problems: z.array(intakeProblemSchema),
  diff: intakeDiffSchema.nullable(),
  runRequest: runRequestSchema.nullable(),
  /**
   * A case list: whether some of its cases contradict a physician's decision and wait for a
   * physician to decide them (no count: the physician sees the cases, /api/cases/conflicts/:id).
   */
  conflictsPending: z.boolean().optional(),
});
export type IntakeDetail = z.infer<typeof intakeDetailSchema>;

/** Query of POST /api/intakes (multipart body with one file field, any name). */
export const intakeUploadQuerySchema = z.object({
  kind: intakeKindSchema,
  /** check: stop after checking, the hygienist applies or discards later; apply: apply when no problem is found. */
  mode: z.enum(['check', 'apply']).default('check'),
  /**
   * Case lists: the last month whose cases the list reports (YYYY-MM), for the uploader's sites;
   * by default the later of its last onset month and the latest rostered month of those sites.
   */
  reportsThrough: z
    .string()
    .regex(/^[0-9]{4}-(0[1-9]|1[0-2])$/, 'reportsThrough is a month, YYYY-MM')
    .transform((m) => `${m}-01`)
    .optional(),
});

/** Response of POST /api/intakes: the intake, and whether the file was already known (checksum). */
export const intakeUploadResponseSchema = z.object({
  intake: intakeDetailSchema,
  /** True when the same file (same checksum) was taken in before; nothing changed. */
  duplicate: z.boolean(),
});
export type IntakeUploadResponse = z.infer<typeof intakeUploadResponseSchema>;

export const intakeListQuerySchema = z.object({
  kind: intakeKindSchema.optional(),
  state: intakeStateSchema.optional(),
  limit: z.coerce.number().int().min(1).max(200).default(50),
  offset: z.coerce.number().int().min(0).default(0),
});
export const intakeListResponseSchema = z.object({ items: z.array(intakeSummarySchema), total: z.number().int() });
export type IntakeListResponse = z.infer<typeof intakeListResponseSchema>;

/** Case status, re-exported for pages that show the case template. */
export { caseStatusSchema };

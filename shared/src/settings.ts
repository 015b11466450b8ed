import { z } from 'zod';
import { caseStatusSchema } from './intake';
import { ageBandEdgesSchema, personTimeBasisSchema, runSettingsSchema } from './runs';
import { monthIsoSchema, windowKindSchema } from './windows';

/**
 * The analysis settings as versions (GET/PUT /api/settings): every run uses the current version
 * and records its number. A change is a new version, never an edit of an old one.
 */
export const settingsVersionSchema = z.object({
  version: z.number().int(),
  settings: runSettingsSchema,
  createdAt: z.string(),
  /** Who made it; "worker environment" for the version a new database was seeded with. */
  createdBy: z.string(),
});
export type SettingsVersion = z.infer<typeof settingsVersionSchema>;

/** The current version (null before the first run or change) and the earlier ones, newest first. */
export const analysisSettingsSchema = z.object({
  current: settingsVersionSchema.nullable(),
  history: z.array(settingsVersionSchema),
});
export type AnalysisSettings = z.infer<typeof analysisSettingsSchema>;

/** Confidence levels offered: the usual ones (common practice). */
export const CONFIDENCE_LEVELS = [0.8, 0.9, 0.95, 0.99] as const;

/**
 * PUT /api/settings: the whole next version; unknown keys refused. `windows` (the month always
 * among them) and `wholePeriodStart` may be left out: then the current version's stay.
 */
export const settingsUpdateSchema = z
  .strictObject({
    personTimeBasis: personTimeBasisSchema,
    per: z.number().positive().max(1e9),
    confidence: z.number().gt(0.5).lt(1),
    countedStatuses: z
      .array(caseStatusSchema)
      .min(1)
      .refine((s) => new Set(s).size === s.length, 'each status once'),
    ageBandEdges: ageBandEdgesSchema,
    windows: z
      .array(windowKindSchema)
      .refine((w) => w.includes('month'), 'the month is always offered')
      .refine((w) => new Set(w).size === w.length, 'each window once')
      .optional(),
    wholePeriodStart: monthIsoSchema.nullable().optional(),
  })
  .superRefine((s, ctx) => {
    if (s.windows?.includes('whole') && !s.wholePeriodStart)
      ctx.addIssue({ code: 'custom', path: ['wholePeriodStart'], message: 'choose the month the whole period starts from' });
  });
export type SettingsUpdate = z.infer<typeof settingsUpdateSchema>;

/** The answer of PUT /api/settings: the version now current, and whether the change asked for a run. */
export const settingsUpdateResultSchema = z.object({ current: settingsVersionSchema, changed: z.boolean(), runRequested: z.boolean() });
export type SettingsUpdateResult = z.infer<typeof settingsUpdateResultSchema>;

import { z } from 'zod';
import { caseStatusSchema } from './intake';
import { ageBandEdgesSchema, personTimeBasisSchema, runSettingsSchema } from './runs';

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

/** PUT /api/settings: the whole next version; unknown keys refused. */
export const settingsUpdateSchema = z.strictObject({
  personTimeBasis: personTimeBasisSchema,
  per: z.number().positive().max(1e9),
  confidence: z.number().gt(0.5).lt(1),
  countedStatuses: z
    .array(caseStatusSchema)
    .min(1)
    .refine((s) => new Set(s).size === s.length, 'each status once'),
  ageBandEdges: ageBandEdgesSchema,
});
export type SettingsUpdate = z.infer<typeof settingsUpdateSchema>;

/** The answer of PUT /api/settings: the version now current, and whether the change asked for a run. */
export const settingsUpdateResultSchema = z.object({ current: settingsVersionSchema, changed: z.boolean(), runRequested: z.boolean() });
export type SettingsUpdateResult = z.infer<typeof settingsUpdateResultSchema>;

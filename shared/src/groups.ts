import { z } from 'zod';
import { countingRuleSchema } from './domain';
import { patchSchemaOf } from './patch-schema';

/** Codes appear in every roster and case file; the same rule the database CHECK holds. */
export const configCodeSchema = z
  .string()
  .trim()
  .toUpperCase()
  .regex(/^[A-Z0-9_-]{1,32}$/, 'letters, digits, _ or -, at most 32');

export const exposureGroupSchema = z.object({
  id: z.number().int(),
  code: z.string(),
  name: z.string(),
  hazard: z.string(),
  /** Ordinal score for trend tests: 0 unexposed, higher is more exposed; null leaves the group out of trends. */
  exposureLevel: z.number().int().nullable(),
  isReference: z.boolean(),
  description: z.string().nullable(),
  updatedAt: z.string(),
});
export type ExposureGroupDto = z.infer<typeof exposureGroupSchema>;

/** Write bodies refuse unknown keys (a misspelt field would otherwise be dropped without a word). */
export const exposureGroupCreateSchema = z.strictObject({
  code: configCodeSchema,
  name: z.string().trim().min(1).max(200),
  hazard: z.string().trim().min(1).max(500),
  exposureLevel: z.number().int().min(0).max(100).nullable(),
  description: z.string().trim().max(2000).nullable().default(null),
});
export type ExposureGroupCreate = z.infer<typeof exposureGroupCreateSchema>;

/** PATCH: any subset, nothing defaulted; the code is fixed once rosters use it. */
export const exposureGroupUpdateSchema = patchSchemaOf(exposureGroupCreateSchema.omit({ code: true }));
export type ExposureGroupUpdate = z.infer<typeof exposureGroupUpdateSchema>;

/** PUT /api/groups/levels: set every group's ordinal level at once (a reordering is one change). */
export const exposureLevelsSchema = z.strictObject({
  levels: z
    .array(z.strictObject({ id: z.number().int(), exposureLevel: z.number().int().min(0).max(100).nullable() }))
    .min(1)
    .max(500),
});

export const outcomeSchema = z.object({
  id: z.number().int(),
  code: z.string(),
  name: z.string(),
  caseDefinition: z.string(),
  countingRule: countingRuleSchema,
  lagMonths: z.number().int(),
  /** The outcome's own reference group; null: the global reference group. */
  referenceGroupId: z.number().int().nullable(),
  updatedAt: z.string(),
});
export type OutcomeDto = z.infer<typeof outcomeSchema>;

export const outcomeCreateSchema = z.strictObject({
  code: configCodeSchema,
  name: z.string().trim().min(1).max(200),
  caseDefinition: z.string().trim().min(1).max(4000),
  countingRule: countingRuleSchema,
  lagMonths: z.number().int().min(0).max(240).default(0),
  referenceGroupId: z.number().int().nullable().default(null),
});
export type OutcomeCreate = z.infer<typeof outcomeCreateSchema>;
export const outcomeUpdateSchema = patchSchemaOf(outcomeCreateSchema.omit({ code: true }));
export type OutcomeUpdate = z.infer<typeof outcomeUpdateSchema>;

export const siteSchema = z.object({
  id: z.number().int(),
  code: z.string(),
  name: z.string(),
  region: z.string().nullable(),
  /** When the administrator retired it (ISO); null while active. A retired site keeps its history. */
  retiredAt: z.string().nullable(),
});
export type SiteDto = z.infer<typeof siteSchema>;

/** POST /api/sites (the administrator): the code appears in every roster and case file. */
export const siteCreateSchema = z.strictObject({
  code: configCodeSchema,
  name: z.string().trim().min(1).max(200),
  region: z.string().trim().max(200).nullable().default(null),
});
export type SiteCreate = z.infer<typeof siteCreateSchema>;

/** PATCH /api/sites/:id: rename (the code stays: files already use it). */
export const siteUpdateSchema = patchSchemaOf(siteCreateSchema.omit({ code: true }));
export type SiteUpdate = z.infer<typeof siteUpdateSchema>;

/** One change of a group or outcome, from the audit log: who, when, before and after. */
export const configChangeSchema = z.object({
  at: z.string(),
  actor: z.string(),
  action: z.string(),
  before: z.record(z.string(), z.unknown()).nullable(),
  after: z.record(z.string(), z.unknown()).nullable(),
});
export type ConfigChange = z.infer<typeof configChangeSchema>;

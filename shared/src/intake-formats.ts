import { z } from 'zod';

/** GET /api/intakes/formats as the client reads it: each kind's columns with their rules (intake-columns.ts). */
export const intakeColumnSchema = z.object({
  name: z.string(),
  required: z.boolean(),
  rule: z.object({ type: z.string() }).loose(),
  description: z.string(),
  example: z.string(),
});
export type IntakeColumn = z.infer<typeof intakeColumnSchema>;

export const intakeFormatsSchema = z.object({ roster: z.array(intakeColumnSchema), cases: z.array(intakeColumnSchema) });
export type IntakeFormats = z.infer<typeof intakeFormatsSchema>;

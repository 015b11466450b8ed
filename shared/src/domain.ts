import { z } from 'zod';

/** The people roles of Ratewarden (../DESIGN vocabulary: who uses it). */
export const roleSchema = z.enum(['hygienist', 'safety_manager', 'physician', 'administrator']);
export type Role = z.infer<typeof roleSchema>;

export const roleLabels: Record<Role, string> = {
  hygienist: 'Occupational hygienist',
  safety_manager: 'Safety manager',
  physician: 'Occupational physician',
  administrator: 'Administrator',
};

/** Recurrent events (injuries) or first event only (a worker leaves the at-risk time after a case). */
export const countingRuleSchema = z.enum(['recurrent', 'first_event']);
export type CountingRule = z.infer<typeof countingRuleSchema>;

/** Health response of /api/health. */
export const healthSchema = z.object({
  status: z.enum(['ok', 'degraded']),
  db: z.enum(['ok', 'down']),
  version: z.string(),
});
export type Health = z.infer<typeof healthSchema>;

/** The JSON body of every error the API returns. */
export const problemSchema = z.object({
  code: z.string(),
  message: z.string(),
  details: z.unknown().optional(),
});
export type Problem = z.infer<typeof problemSchema>;

import { z } from 'zod';

export const intakeKindSchema = z.enum(['roster', 'cases']);
export type IntakeKind = z.infer<typeof intakeKindSchema>;

/** received → checked → applied, or rejected; an older applied version becomes superseded. */
export const intakeStateSchema = z.enum(['received', 'checked', 'applied', 'rejected', 'superseded']);
export type IntakeState = z.infer<typeof intakeStateSchema>;

export const caseStatusSchema = z.enum(['suspected', 'confirmed', 'ruled_out']);
export type CaseStatus = z.infer<typeof caseStatusSchema>;

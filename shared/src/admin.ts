import { z } from 'zod';
import { roleSchema } from './domain';

/** A person as the administrator sees them. */
export const adminUserSchema = z.object({
  id: z.string(),
  email: z.string(),
  name: z.string(),
  role: roleSchema.nullable(),
  siteIds: z.array(z.number().int()),
  signedUp: z.boolean().describe('false while pre-provisioned and not yet signed in'),
  lastSignInAt: z.string().nullable(),
});
export type AdminUser = z.infer<typeof adminUserSchema>;

/** PATCH /api/admin/users/:id: the role and the sites, both given (unknown keys refused, as in every write body). */
export const userAccessUpdateSchema = z.strictObject({
  role: roleSchema.nullable(),
  siteIds: z.array(z.number().int().positive()).max(500),
});
export type UserAccessUpdate = z.infer<typeof userAccessUpdateSchema>;

/** POST /api/admin/users: provision a person by e-mail before their first sign-in. */
export const userInviteSchema = userAccessUpdateSchema.extend({
  email: z.string().trim().toLowerCase().email(),
  name: z.string().trim().min(1).max(200),
});
export type UserInvite = z.infer<typeof userInviteSchema>;

export const integrationClientSchema = z.object({
  clientId: z.string(),
  name: z.string(),
  registeredAt: z.string(),
  revokedAt: z.string().nullable(),
});
export type IntegrationClientView = z.infer<typeof integrationClientSchema>;

/** POST /api/admin/clients */
export const clientRegistrationSchema = z.strictObject({
  clientId: z
    .string()
    .trim()
    .regex(/^[A-Za-z0-9._:-]{3,128}$/, 'letters, digits and . _ : - only (3–128)'),
  name: z.string().trim().min(1).max(200),
});
export type ClientRegistration = z.infer<typeof clientRegistrationSchema>;

export const auditQuerySchema = z.object({
  action: z.string().max(100).optional(),
  actor: z.string().max(200).optional().describe("part of the person's name, e-mail or client id"),
  from: z.iso.datetime({ offset: true }).or(z.iso.date()).optional(),
  to: z.iso.datetime({ offset: true }).or(z.iso.date()).optional(),
  limit: z.coerce.number().int().min(1).max(1000).default(200),
  before: z.coerce.number().int().positive().optional().describe('id to page backwards from'),
});
export type AuditQuery = z.infer<typeof auditQuerySchema>;

export const auditEventSchema = z.object({
  id: z.number(),
  at: z.string(),
  actor: z.string(),
  /** The person's name when the actor is a person with an account; null for clients and the system. */
  actorName: z.string().nullable().default(null),
  action: z.string(),
  target: z.string().nullable(),
  /** What the target is called now (a person's or group's name, an intake's file), when it still exists. */
  targetName: z.string().nullable().default(null),
  detail: z.record(z.string(), z.unknown()),
  ip: z.string().nullable(),
});
export type AuditEventView = z.infer<typeof auditEventSchema>;

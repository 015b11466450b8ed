import { z } from 'zod';
import { roleSchema } from './domain';

/** GET /api/session: who is signed in (or null) and the CSRF token every state-changing request must echo. */
export const sessionSchema = z.object({
  user: z
    .object({
      id: z.string(),
      email: z.string(),
      name: z.string(),
      role: roleSchema.nullable(),
      siteIds: z.array(z.number().int()),
    })
    .nullable(),
  csrfToken: z.string(),
});
export type Session = z.infer<typeof sessionSchema>;
export type SessionUser = NonNullable<Session['user']>;

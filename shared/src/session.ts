import { z } from 'zod';
import { roleSchema } from './domain';

/**
 * GET /api/session: who is signed in (or null) and the CSRF token every state-changing request must
 * echo (null when nobody is signed in: there is nothing to protect, and no session is stored).
 */
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
  csrfToken: z.string().nullable(),
  /** The server's SMALL_CELL_THRESHOLD: counts from 1 to this − 1 are withheld (the screen says "<n" with it). */
  smallCellThreshold: z.number().int().min(3),
});
export type Session = z.infer<typeof sessionSchema>;
export type SessionUser = NonNullable<Session['user']>;

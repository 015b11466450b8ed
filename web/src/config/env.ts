import { z } from 'zod';

/**
 * The web app's build-time environment, parsed once. Vite inlines `import.meta.env.VITE_*`.
 * - VITE_SMALL_CELL_THRESHOLD: counts below this are shown as "<n" to every role but the physician.
 */
const envSchema = z.object({
  VITE_SMALL_CELL_THRESHOLD: z.coerce.number().int().min(3).default(5), // with 2, a withheld count could only be 1
});

export const env = envSchema.parse(import.meta.env);

import { z } from 'zod';

/**
 * The body of a PATCH made from a create schema: every field optional and none defaulted (a
 * default would overwrite the stored value of a field the request did not name), unknown keys
 * refused as in the create schema.
 */
export function patchSchemaOf<Shape extends z.ZodRawShape>(schema: z.ZodObject<Shape, z.core.$strict>) {
  const shape = Object.fromEntries(
    Object.entries(schema.shape).map(([key, field]) => [key, field instanceof z.ZodDefault ? field.removeDefault() : field]),
  ) as { [K in keyof Shape]: Shape[K] extends z.ZodDefault<infer Inner> ? Inner : Shape[K] };
  return z.strictObject(shape).partial();
}

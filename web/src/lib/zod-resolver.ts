import type { FieldErrors, FieldValues, Resolver } from 'react-hook-form';
import type { ZodType } from 'zod';

/**
 * Connects a zod schema to react-hook-form: the parsed (transformed) output becomes the submitted
 * values, and each issue becomes a field error at its path, so messages sit beside their inputs.
 */
export function zodResolver<In extends FieldValues, Out extends FieldValues>(schema: ZodType<Out, In>): Resolver<In, unknown, Out> {
  return async (values) => {
    const result = await schema.safeParseAsync(values);
    if (result.success) return { values: result.data, errors: {} };
    const errors: Record<string, unknown> = {};
    for (const issue of result.error.issues) {
      const path = issue.path.map(String);
      if (path.length === 0) path.push('root');
      let node = errors;
      for (const key of path.slice(0, -1)) node = (node[key] ??= {}) as Record<string, unknown>;
      const leaf = path[path.length - 1]!;
      // The first message for a field is the one worth reading; later ones are usually consequences.
      node[leaf] ??= { type: issue.code, message: issue.message };
    }
    return { values: {}, errors: errors as FieldErrors<In> };
  };
}

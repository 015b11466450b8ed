import { isDeepStrictEqual } from 'node:util';

/**
 * The fields of a patch whose values differ from the stored ones (a field left out, or given
 * as undefined, is not a change). An empty answer means the PATCH changes nothing: it is neither
 * written nor audited.
 */
export function changedFields<P extends object>(stored: { [K in keyof P]?: unknown }, patch: P): Array<keyof P & string> {
  return (Object.keys(patch) as Array<keyof P & string>).filter((k) => patch[k] !== undefined && !isDeepStrictEqual(patch[k], stored[k]));
}

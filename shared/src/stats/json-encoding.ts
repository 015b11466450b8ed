/**
 * JSON encoding of results: JSON has no infinity, so ±∞ become the strings "Infinity" and
 * "-Infinity" (the convention of the published-examples file and of the CLI); undefined values
 * are already null. Numbers keep full double precision (rounding is the UI's job).
 *
 * @example
 * toJsonValue({ upper: Infinity, lower: 0.5 }) // { upper: 'Infinity', lower: 0.5 }
 */
export type JsonValue = null | boolean | number | string | JsonValue[] | { [key: string]: JsonValue };

/** Recursively replace ±∞ with strings (and, defensively, NaN with null). @example toJsonValue([-Infinity]) // ['-Infinity'] */
export function toJsonValue(value: unknown): JsonValue {
  if (value === null || value === undefined) return null;
  if (typeof value === 'number') {
    if (Number.isNaN(value)) return null;
    if (value === Infinity) return 'Infinity';
    if (value === -Infinity) return '-Infinity';
    return value;
  }
  if (typeof value === 'string' || typeof value === 'boolean') return value;
  if (Array.isArray(value)) return value.map(toJsonValue);
  if (typeof value === 'object') {
    const out: { [key: string]: JsonValue } = {};
    for (const [k, v] of Object.entries(value as Record<string, unknown>)) {
      // defineProperty: a key named "__proto__" stays a key instead of setting the prototype.
      if (v !== undefined) Object.defineProperty(out, k, { value: toJsonValue(v), enumerable: true, writable: true, configurable: true });
    }
    return out;
  }
  return null;
}

/**
 * toJsonValue of an object, typed as one: what a jsonb column of details stores.
 * @example toJsonObject({ upper: Infinity, lower: 0.5 }) // { upper: 'Infinity', lower: 0.5 }
 */
export function toJsonObject(value: object): { [key: string]: JsonValue } {
  const encoded = toJsonValue(value);
  return encoded !== null && typeof encoded === 'object' && !Array.isArray(encoded) ? encoded : {};
}

const nonFinite = (_key: string, v: unknown) =>
  typeof v === 'number' && !Number.isFinite(v) ? (Number.isNaN(v) ? null : v > 0 ? 'Infinity' : '-Infinity') : v;

/**
 * JSON.stringify(toJsonValue(value)) in one pass, without building the converted copy (a run
 * encodes thousands of result details). @example stringifyJson({ upper: Infinity }) // '{"upper":"Infinity"}'
 */
export function stringifyJson(value: unknown): string {
  return JSON.stringify(value ?? null, nonFinite);
}

/** Inverse for numbers read back: "Infinity"/"-Infinity" → ±∞. @example fromJsonNumber('Infinity') // Infinity */
export function fromJsonNumber(value: number | string | null): number | null {
  if (value === 'Infinity') return Infinity;
  if (value === '-Infinity') return -Infinity;
  if (typeof value === 'string') return Number(value);
  return value;
}

/**
 * Input validation at the entry of every public function of the core. Invalid input (a
 * negative or non-integer count, NaN or infinite numbers, a confidence outside (0, 1)) is a
 * caller error and raises one typed error with every problem listed; degenerate but valid
 * input (zero cases, zero person-time, a zero cell) is not an error and is reported in the
 * result instead (see `result-types.ts`).
 *
 * @example
 * assertCount('exposed.cases', -1)
 * // throws StatsValidationError: "exposed.cases: must be a non-negative integer count (got -1)"
 */
export interface ValidationIssue {
  path: string;
  message: string;
}

/** The single error type thrown for invalid input anywhere in the core. */
export class StatsValidationError extends Error {
  override readonly name = 'StatsValidationError';
  readonly issues: ValidationIssue[];

  constructor(issues: ValidationIssue[]) {
    super(issues.map((i) => (i.path ? `${i.path}: ${i.message}` : i.message)).join('; '));
    this.issues = issues;
  }
}

function fail(path: string, message: string): never {
  throw new StatsValidationError([{ path, message }]);
}

/** A count: finite, non-negative integer. @example assertCount('cases', 3) // undefined (no error) */
export function assertCount(path: string, value: number): void {
  if (!Number.isInteger(value) || value < 0) fail(path, `must be a non-negative integer count (got ${String(value)})`);
}

/** Person-time, expected counts, exposure: finite and ≥ 0. @example assertNonNegative('personTime', 0) // undefined */
export function assertNonNegative(path: string, value: number): void {
  if (!Number.isFinite(value) || value < 0) fail(path, `must be a finite number ≥ 0 (got ${String(value)})`);
}

/** A strictly positive finite number (a rate multiplier, hours per year). @example assertPositive('per', 1000) // undefined */
export function assertPositive(path: string, value: number): void {
  if (!Number.isFinite(value) || value <= 0) fail(path, `must be a finite number > 0 (got ${String(value)})`);
}

/** Any finite number (a trend score). @example assertFinite('score', -1) // undefined */
export function assertFinite(path: string, value: number): void {
  if (!Number.isFinite(value)) fail(path, `must be a finite number (got ${String(value)})`);
}

/** Confidence level strictly inside (0, 1). @example assertConfidence(0.95) // undefined */
export function assertConfidence(value: number, path = 'confidence'): void {
  if (!Number.isFinite(value) || value <= 0 || value >= 1) fail(path, `must be strictly between 0 and 1 (got ${String(value)})`);
}

/** A probability in [0, 1] (p-values). @example assertProbability('p[0]', 0.2) // undefined */
export function assertProbability(path: string, value: number): void {
  if (!Number.isFinite(value) || value < 0 || value > 1) fail(path, `must be a probability in [0, 1] (got ${String(value)})`);
}

/**
 * Cases with no person-time cannot occur in a cohort, so they are invalid input rather than
 * a degenerate rate. @example assertCasesHavePersonTime('exposed', 0, 0) // undefined
 */
export function assertCasesHavePersonTime(path: string, cases: number, personTime: number): void {
  if (cases > 0 && personTime === 0) fail(path, `has ${cases} cases but zero person-time`);
}

/** Cases cannot exceed the group size. @example assertCasesWithinTotal('exposed', 3, 10) // undefined */
export function assertCasesWithinTotal(path: string, cases: number, total: number): void {
  if (cases > total) fail(path, `cases (${cases}) exceed total (${total})`);
}

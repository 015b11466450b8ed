import type { Problem } from '@ratewarden/shared/domain';

/** A failed API call, carrying the server's problem body `{ code, message, details? }`. */
export class ApiError extends Error {
  override readonly name = 'ApiError';
  readonly status: number;
  readonly problem: Problem;

  constructor(status: number, problem: Problem) {
    super(problem.message);
    this.status = status;
    this.problem = problem;
  }
}

export function isApiError(e: unknown): e is ApiError {
  return e instanceof ApiError;
}

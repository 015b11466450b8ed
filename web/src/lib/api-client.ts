import { problemSchema } from '@ratewarden/shared/domain';
import type { ZodType } from 'zod';
import { ApiError } from './api-error';

/**
 * The one fetch wrapper of the web app: JSON in and out, same-origin credentials, the CSRF header
 * on every state-changing request, and a typed ApiError carrying the server's problem body.
 */
let csrfToken: string | null = null;

/** Set from GET /api/session; every POST/PUT/PATCH/DELETE echoes it in `x-csrf-token`. */
export function setCsrfToken(token: string | null): void {
  csrfToken = token;
}

export function csrfHeaders(method: string): Record<string, string> {
  return method !== 'GET' && method !== 'HEAD' && csrfToken ? { 'x-csrf-token': csrfToken } : {};
}

/** Turn a non-2xx response into an ApiError, keeping the problem body when there is one. */
export async function problemFrom(res: Response): Promise<ApiError> {
  let body: unknown = null;
  try {
    body = await res.json();
  } catch {
    body = null;
  }
  const parsed = problemSchema.safeParse(body);
  return new ApiError(
    res.status,
    parsed.success ? parsed.data : { code: `http_${res.status}`, message: `the server answered ${res.status} ${res.statusText}`.trim() },
  );
}

export interface RequestOptions {
  method?: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
  body?: unknown;
  signal?: AbortSignal;
}

export async function apiRequest<T>(path: string, schema: ZodType<T>, options: RequestOptions = {}): Promise<T> {
  const method = options.method ?? 'GET';
  const headers: Record<string, string> = { accept: 'application/json', ...csrfHeaders(method) };
  let body: BodyInit | undefined;
  if (options.body instanceof FormData || options.body instanceof Blob) body = options.body;
  else if (options.body !== undefined) {
    headers['content-type'] = 'application/json';
    body = JSON.stringify(options.body);
  }
  let res: Response;
  try {
    res = await fetch(path, { method, headers, body, credentials: 'same-origin', signal: options.signal });
  } catch (e) {
    if ((e as Error).name === 'AbortError') throw e;
    throw new ApiError(0, { code: 'network_error', message: 'the server could not be reached; check your connection' });
  }
  if (!res.ok) throw await problemFrom(res);
  if (res.status === 204) return schema.parse(undefined);
  const json: unknown = await res.json();
  const parsed = schema.safeParse(json);
  if (!parsed.success) {
    throw new ApiError(res.status, { code: 'unexpected_response', message: `the server's answer to ${path} did not have the expected shape` });
  }
  return parsed.data;
}

export const api = {
  get: <T>(path: string, schema: ZodType<T>, signal?: AbortSignal) => apiRequest(path, schema, { signal }),
  post: <T>(path: string, schema: ZodType<T>, body?: unknown) => apiRequest(path, schema, { method: 'POST', body }),
  put: <T>(path: string, schema: ZodType<T>, body?: unknown) => apiRequest(path, schema, { method: 'PUT', body }),
  patch: <T>(path: string, schema: ZodType<T>, body?: unknown) => apiRequest(path, schema, { method: 'PATCH', body }),
  delete: <T>(path: string, schema: ZodType<T>) => apiRequest(path, schema, { method: 'DELETE' }),
};

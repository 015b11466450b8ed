import { problemSchema } from '@ratewarden/shared/domain';
import type { ZodType } from 'zod';
import { csrfHeaders } from './api-client';
import { ApiError } from './api-error';

/**
 * A multipart upload through XMLHttpRequest, because fetch cannot report upload progress.
 * Same rules as the API client: same-origin credentials, the CSRF header, ApiError on failure.
 */
export function uploadWithProgress<T>(
  url: string,
  form: FormData,
  schema: ZodType<T>,
  onProgress: (fraction: number) => void,
  signal?: AbortSignal,
): Promise<T> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', url);
    xhr.withCredentials = false; // same-origin requests send cookies anyway
    xhr.setRequestHeader('accept', 'application/json');
    for (const [k, v] of Object.entries(csrfHeaders('POST'))) xhr.setRequestHeader(k, v);
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) onProgress(e.loaded / e.total);
    };
    xhr.onerror = () => reject(new ApiError(0, { code: 'network_error', message: 'the upload did not reach the server; check your connection' }));
    xhr.onabort = () => reject(new DOMException('upload cancelled', 'AbortError'));
    xhr.onload = () => {
      let body: unknown = null;
      try {
        body = JSON.parse(xhr.responseText);
      } catch {
        body = null;
      }
      if (xhr.status >= 200 && xhr.status < 300) {
        const parsed = schema.safeParse(body);
        if (parsed.success) resolve(parsed.data);
        else reject(new ApiError(xhr.status, { code: 'unexpected_response', message: 'the server answered the upload in an unexpected shape' }));
        return;
      }
      const problem = problemSchema.safeParse(body);
      reject(new ApiError(xhr.status, problem.success ? problem.data : { code: `http_${xhr.status}`, message: `the server answered ${xhr.status}` }));
    };
    signal?.addEventListener('abort', () => xhr.abort());
    xhr.send(form);
  });
}

import { isRouteErrorResponse, Link, useRouteError } from 'react-router';
import type { Problem } from '@ratewarden/shared/domain';
import { paths } from '../../config/paths';
import { isApiError } from '../../lib/api-error';
import { ProblemNotice } from './problem-notice';

/** Turns whatever a page threw into a problem worth reading; the frame around it stays usable. */
export function problemOf(error: unknown): { status: number; problem: Problem } {
  if (isApiError(error)) return { status: error.status, problem: error.problem };
  if (isRouteErrorResponse(error)) {
    return {
      status: error.status,
      problem: {
        code: error.status === 404 ? 'not_found' : `http_${error.status}`,
        message: error.status === 404 ? 'there is no page at this address' : error.statusText,
      },
    };
  }
  return { status: 0, problem: { code: 'client_error', message: error instanceof Error ? error.message : 'the page failed to render' } };
}

const titles: Record<number, string> = {
  401: 'Sign in to see this page',
  403: 'Your role does not allow this',
  404: 'Not found',
};

export function RouteError() {
  const { status, problem } = problemOf(useRouteError());
  return (
    <section className="max-w-3xl">
      <ProblemNotice title={titles[status] ?? 'This page could not be shown'} problem={problem}>
        <p className="mt-3 flex gap-4">
          {status === 401 ? (
            <a href={paths.signIn} className="font-medium text-accent underline">
              Sign in
            </a>
          ) : (
            <button type="button" onClick={() => window.location.reload()} className="font-medium text-accent underline">
              Try again
            </button>
          )}
          <Link to={paths.home} className="font-medium text-accent underline">
            Back to the start
          </Link>
        </p>
      </ProblemNotice>
    </section>
  );
}

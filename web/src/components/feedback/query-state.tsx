import type { UseQueryResult } from '@tanstack/react-query';
import type { ReactNode } from 'react';
import { problemOf } from './route-error';
import { PageLoading } from './page-loading';
import { ProblemNotice } from './problem-notice';

/**
 * Loading and error states for a query a page runs beside its suspense data (results that follow
 * a filter), so the filters stay on screen while the figures load or when they fail.
 */
export function QueryState<T>({ query, label, children }: { query: UseQueryResult<T>; label: string; children: (data: T) => ReactNode }) {
  if (query.isPending) return <PageLoading label={`Loading ${label}`} />;
  if (query.isError) {
    return (
      <ProblemNotice title={`The ${label} could not be loaded`} problem={problemOf(query.error).problem}>
        <button type="button" className="mt-3 font-medium text-accent underline" onClick={() => void query.refetch()}>
          Try again
        </button>
      </ProblemNotice>
    );
  }
  return (
    <div aria-busy={query.isFetching} className={query.isPlaceholderData ? 'opacity-60 transition-opacity' : ''}>
      {children(query.data)}
    </div>
  );
}

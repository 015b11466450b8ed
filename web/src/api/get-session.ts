import { sessionSchema, type Session } from '@ratewarden/shared/session';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiPaths } from '../config/paths';
import { api, setCsrfToken } from '../lib/api-client';
import { setSmallCellThreshold } from '../lib/small-cells';

export const sessionKeys = {
  all: ['session'] as const,
  current: () => [...sessionKeys.all, 'current'] as const,
};

export async function getSession(signal?: AbortSignal): Promise<Session> {
  const session = await api.get(apiPaths.session, sessionSchema, signal);
  setCsrfToken(session.csrfToken);
  setSmallCellThreshold(session.smallCellThreshold);
  return session;
}

export const sessionQueryOptions = () =>
  queryOptions({ queryKey: sessionKeys.current(), queryFn: ({ signal }) => getSession(signal), staleTime: 60_000, retry: false });

export function useSession() {
  return useQuery(sessionQueryOptions());
}

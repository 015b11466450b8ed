import { roleMay, type Permission } from '@ratewarden/shared/permissions';
import type { EnsureQueryDataOptions } from '@tanstack/react-query';
import { sessionQueryOptions } from '../../api/get-session';
import { queryClient } from '../query-client';

/**
 * A route loader's work: read the session, and only when the role has the page's permission,
 * prefetch the queries the page suspends on (the page says itself when the role may not).
 */
export async function prefetchFor(permission: Permission, ...options: Array<EnsureQueryDataOptions<any, any, any, any>>): Promise<null> {
  const session = await queryClient.ensureQueryData(sessionQueryOptions());
  if (roleMay(session.user?.role, permission)) await Promise.all(options.map((o) => queryClient.ensureQueryData(o)));
  return null;
}

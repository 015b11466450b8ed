import type { Request, RequestHandler } from 'express';
import type { DataSource } from 'typeorm';
import type { Principal } from '@ratewarden/shared/permissions';
import type { ApiConfig } from '../config';
import { versionsOf } from '../lib/data-versions';
import { verifyClientToken } from './client-tokens';
import { loadUser } from './user-accounts';

/** People a process keeps before it forgets them all. */
const KEPT_PEOPLE_MAX = 10_000;

/**
 * Sets `req.principal` from a bearer token (integration clients) or the session (people). A
 * person's role and sites are kept in memory under the `access` counter of data_versions they
 * were read at (lib/data-versions.ts): any change to people, roles or site access, by any
 * process, raises it at commit, so a role removed takes effect from the next request on.
 */
export function principalMiddleware(ds: DataSource, config: ApiConfig): RequestHandler {
  const kept = new Map<string, { version: string; user: Principal }>();
  const personOf = async (req: Request, userId: string): Promise<Principal | undefined> => {
    const { access } = await versionsOf(ds, req);
    const found = kept.get(userId);
    if (found?.version === access) return found.user;
    const user = await loadUser(ds, userId);
    if (kept.size >= KEPT_PEOPLE_MAX) kept.clear();
    if (user) kept.set(userId, { version: access, user });
    else kept.delete(userId);
    return user;
  };
  return async (req, _res, next) => {
    try {
      const auth = req.get('authorization');
      if (auth) {
        const [scheme, token] = auth.split(' ');
        if (scheme?.toLowerCase() === 'bearer' && token) req.principal = await verifyClientToken(ds, config, token);
        return next();
      }
      const userId = req.session?.userId;
      if (userId) {
        const user = await personOf(req, userId);
        if (user) req.principal = user;
        else delete req.session.userId;
      }
      next();
    } catch (err) {
      next(err);
    }
  };
}

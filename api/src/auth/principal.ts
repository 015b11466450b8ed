import type { RequestHandler } from 'express';
import type { DataSource } from 'typeorm';
import type { ApiConfig } from '../config';
import { verifyClientToken } from './client-tokens';
import { loadUser } from './user-accounts';

/** Sets `req.principal` from a bearer token (integration clients) or the session (people). */
export function principalMiddleware(ds: DataSource, config: ApiConfig): RequestHandler {
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
        const user = await loadUser(ds, userId);
        if (user) req.principal = user;
        else delete req.session.userId;
      }
      next();
    } catch (err) {
      next(err);
    }
  };
}

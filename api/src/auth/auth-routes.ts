import { Router, type Request } from 'express';
import type { DataSource } from 'typeorm';
import type { Session } from '@ratewarden/shared/session';
import type { ApiConfig } from '../config';
import { recordAudit } from '../audit/audit-log';
import { signInRateLimit } from '../middleware/rate-limits';
import { csrfProtection, csrfTokenOf } from './csrf';
import { discover } from './discovery';
import { createOidcPassport, type SignedIn } from './oidc-sign-in';
import { loadUser } from './user-accounts';

const regenerate = (req: Request) => new Promise<void>((resolve, reject) => req.session.regenerate((err) => (err ? reject(err) : resolve())));
const save = (req: Request) => new Promise<void>((resolve, reject) => req.session.save((err) => (err ? reject(err) : resolve())));

/** `/auth/login`, `/auth/callback`, `/auth/logout`: sign-in and sign-out at both ends. */
export function authRouter(ds: DataSource, config: ApiConfig): Router {
  const router = Router();
  const { passport, ready } = createOidcPassport(ds, config);
  const limiter = signInRateLimit(config.AUTH_RATE_LIMIT);
  router.use(passport.initialize());

  router.get('/login', limiter, async (req, res, next) => {
    try {
      await ready();
      // Only a path on this site: "//host" and "/\\host" would leave it (browsers read both as another host).
      const asked = typeof req.query.returnTo === 'string' ? req.query.returnTo : '';
      const returnTo = /^\/(?![/\\])/.test(asked) ? asked : '/';
      req.session.returnTo = returnTo;
      passport.authenticate('oidc')(req, res, next);
    } catch (err) {
      next(err);
    }
  });

  router.get('/callback', limiter, async (req, res, next) => {
    try {
      await ready();
    } catch (err) {
      return next(err);
    }
    passport.authenticate('oidc', { session: false }, async (err: unknown, signedIn: SignedIn | false) => {
      try {
        if (err) throw err;
        if (!signedIn) return res.redirect('/?signin=failed');
        const returnTo = req.session.returnTo ?? '/';
        await regenerate(req); // a fresh session id at sign-in defeats session fixation
        req.session.userId = signedIn.userId;
        req.session.idToken = signedIn.idToken;
        csrfTokenOf(req);
        const user = await loadUser(ds, signedIn.userId);
        await recordAudit(ds, {
          actor: user ?? null,
          action: 'auth.sign_in',
          target: `user:${signedIn.userId}`,
          detail: { firstSignIn: signedIn.created },
          ip: req.ip,
        });
        // Stored before the redirect goes out: the browser asks for the session as soon as it lands.
        await save(req);
        res.redirect(returnTo);
      } catch (e) {
        next(e);
      }
    })(req, res, next);
  });

  router.post('/logout', csrfProtection, async (req, res, next) => {
    try {
      const idToken = req.session.idToken;
      if (req.principal) await recordAudit(ds, { actor: req.principal, action: 'auth.sign_out', ip: req.ip });
      await new Promise<void>((resolve) => req.session.destroy(() => resolve()));
      res.clearCookie('rw.sid');
      let target = '/';
      try {
        const m = await discover(config.OIDC_ISSUER);
        if (m.end_session_endpoint) {
          const url = new URL(m.end_session_endpoint);
          if (idToken) url.searchParams.set('id_token_hint', idToken);
          url.searchParams.set('client_id', config.OIDC_CLIENT_ID);
          url.searchParams.set('post_logout_redirect_uri', config.APP_BASE_URL);
          target = url.href;
        }
      } catch {
        // The identity provider is away: the Ratewarden session is gone all the same.
      }
      res.redirect(303, target);
    } catch (err) {
      next(err);
    }
  });
  return router;
}

/**
 * `GET /api/session`: who is signed in (or null) and, for a signed-in person, the CSRF token for
 * state-changing requests. An anonymous reader gets no token, so reading stores no session.
 */
export function sessionRouter(smallCellThreshold: number): Router {
  const router = Router();
  router.get('/', (req, res) => {
    const p = req.principal;
    const body: Session = {
      user: p?.kind === 'user' ? { id: p.id, email: p.email, name: p.name, role: p.role, siteIds: p.siteIds } : null,
      csrfToken: p?.kind === 'user' ? csrfTokenOf(req) : null,
      smallCellThreshold,
    };
    res.set('Cache-Control', 'no-store').json(body);
  });
  return router;
}

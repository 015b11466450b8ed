import type { RequestHandler } from 'express';
import { clientPermissions, roleMay, type Permission, type Principal } from '@ratewarden/shared/permissions';
import { AppError } from '../lib/app-error';

declare module 'express-serve-static-core' {
  interface Request {
    /** Set by the session or bearer-token middleware; absent when nobody is signed in. */
    principal?: Principal;
  }
}

/** A guard carries its permission so the route table can be read back from the app (see route-table.ts). */
export type Guard = RequestHandler & { permission: Permission };

/** Route guard: 401 without a principal, 403 when its role (or client status) lacks the permission. */
export function authorize(permission: Permission): Guard {
  const guard: RequestHandler = (req, _res, next) => {
    const p = req.principal;
    if (!p) return next(new AppError('unauthenticated', 'sign in first'));
    const allowed = p.kind === 'client' ? clientPermissions.includes(permission) : roleMay(p.role, permission);
    if (!allowed) return next(new AppError('forbidden', 'your role does not allow this'));
    next();
  };
  return Object.assign(guard, { permission });
}

/** The signed-in person, for routes that only people (not integration clients) reach. */
export function userOf(req: { principal?: Principal }): Extract<Principal, { kind: 'user' }> {
  const p = req.principal;
  if (!p) throw new AppError('unauthenticated', 'sign in first');
  if (p.kind !== 'user') throw new AppError('forbidden', 'integration clients may only submit intakes');
  return p;
}

/**
 * Site scoping: the sites a principal may read or write. Integration clients act for every site
 * (their token is issued per HR system); people see only the sites assigned to them.
 */
export function siteScope(p: Principal): number[] | 'all' {
  return p.kind === 'client' ? 'all' : p.siteIds;
}

/** Throws 403 unless the principal may act on every one of `siteIds`. */
export function assertSites(p: Principal, siteIds: Iterable<number>): void {
  const scope = siteScope(p);
  if (scope === 'all') return;
  for (const id of siteIds) {
    if (!scope.includes(id)) throw new AppError('forbidden', `you have no access to site ${id}`);
  }
}

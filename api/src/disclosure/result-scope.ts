import type { DataSource } from 'typeorm';
import type { Principal } from '@ratewarden/shared/permissions';
import { assertSites, siteScope } from '../auth/authorize';
import { AppError } from '../lib/app-error';
import { readsEverySite } from './run-frame';

/**
 * The scope a reader gets: one site when asked for (and allowed), else the whole company, which
 * only a reader of every site may see, since company figures include every site's workers.
 * Returns the site id, or null for the company-wide rows.
 */
export async function resultScope(ds: DataSource, principal: Principal, siteId: number | undefined): Promise<number | null> {
  if (siteId !== undefined) {
    assertSites(principal, [siteId]);
    return siteId;
  }
  if (!(await readsEverySite(ds, principal))) {
    throw new AppError('forbidden', 'company-wide results include sites you have no access to: ask for one of your sites with ?siteId=', {
      siteIds: siteScope(principal),
    });
  }
  return null;
}

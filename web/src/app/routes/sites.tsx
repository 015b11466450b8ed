import { sitesQueryOptions } from '../../api/get-sites';
import { RequirePermission } from '../../features/access/require-permission';
import { SitesPage } from '../../features/sites/sites-page';
import { prefetchFor } from './prefetch';

export function loader() {
  return prefetchFor('sites:manage', sitesQueryOptions());
}

export function Component() {
  return <RequirePermission permission="sites:manage">{() => <SitesPage />}</RequirePermission>;
}

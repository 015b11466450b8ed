import { groupsQueryOptions } from '../../api/get-groups';
import { outcomesQueryOptions } from '../../api/get-outcomes';
import { settingsQueryOptions } from '../../api/get-settings';
import { sitesQueryOptions } from '../../api/get-sites';
import { RequirePermission } from '../../features/access/require-permission';
import { FirstRunPage } from '../../features/home/first-run-page';
import { prefetchFor } from './prefetch';

export function loader() {
  return prefetchFor('sites:manage', sitesQueryOptions(), groupsQueryOptions(), outcomesQueryOptions(), settingsQueryOptions());
}

export function Component() {
  return <RequirePermission permission="sites:manage">{() => <FirstRunPage />}</RequirePermission>;
}

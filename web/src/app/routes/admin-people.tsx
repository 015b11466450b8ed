import { usersQueryOptions } from '../../features/admin/api/get-users';
import { PeoplePage } from '../../features/admin/people-page';
import { sitesQueryOptions } from '../../api/get-sites';
import { RequirePermission } from '../../features/access/require-permission';
import { prefetchFor } from './prefetch';

export function loader() {
  return prefetchFor('users:manage', usersQueryOptions(), sitesQueryOptions());
}

export function Component() {
  return <RequirePermission permission="users:manage">{() => <PeoplePage />}</RequirePermission>;
}

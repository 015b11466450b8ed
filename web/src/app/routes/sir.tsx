import { groupsQueryOptions } from '../../api/get-groups';
import { outcomesQueryOptions } from '../../api/get-outcomes';
import { sitesQueryOptions } from '../../api/get-sites';
import { currentRunQueryOptions } from '../../api/get-run';
import { SirPage } from '../../features/sir/sir-page';
import { RequirePermission } from '../../features/access/require-permission';
import { prefetchFor } from './prefetch';

export function loader() {
  return prefetchFor('aggregates:read', currentRunQueryOptions(), outcomesQueryOptions(), groupsQueryOptions(), sitesQueryOptions());
}

export function Component() {
  return <RequirePermission permission="aggregates:read">{(user) => <SirPage user={user} />}</RequirePermission>;
}

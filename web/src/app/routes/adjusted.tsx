import { flagsQueryOptions } from '../../api/get-flags';
import { groupsQueryOptions } from '../../api/get-groups';
import { outcomesQueryOptions } from '../../api/get-outcomes';
import { sitesQueryOptions } from '../../api/get-sites';
import { currentRunQueryOptions } from '../../api/get-run';
import { AdjustedPage } from '../../features/results/adjusted-page';
import { RequirePermission } from '../../features/access/require-permission';
import { prefetchFor } from './prefetch';

export function loader() {
  return prefetchFor('aggregates:read', currentRunQueryOptions(), outcomesQueryOptions(), groupsQueryOptions(), sitesQueryOptions(), flagsQueryOptions({}));
}

export function Component() {
  return <RequirePermission permission="aggregates:read">{(user) => <AdjustedPage user={user} />}</RequirePermission>;
}

import { groupsQueryOptions } from '../../api/get-groups';
import { GroupsPage } from '../../features/groups/groups-page';
import { RequirePermission } from '../../features/access/require-permission';
import { prefetchFor } from './prefetch';

export function loader() {
  return prefetchFor('config:read', groupsQueryOptions());
}

export function Component() {
  return <RequirePermission permission="config:read">{(user) => <GroupsPage user={user} />}</RequirePermission>;
}

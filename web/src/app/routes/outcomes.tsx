import { groupsQueryOptions } from '../../api/get-groups';
import { outcomesQueryOptions } from '../../api/get-outcomes';
import { OutcomesPage } from '../../features/groups/outcomes-page';
import { RequirePermission } from '../../features/access/require-permission';
import { prefetchFor } from './prefetch';

export function loader() {
  return prefetchFor('config:read', outcomesQueryOptions(), groupsQueryOptions());
}

export function Component() {
  return <RequirePermission permission="config:read">{(user) => <OutcomesPage user={user} />}</RequirePermission>;
}

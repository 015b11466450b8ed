import { groupsQueryOptions } from '../../api/get-groups';
import { outcomesQueryOptions } from '../../api/get-outcomes';
import { runsQueryOptions } from '../../features/runs/api/get-runs';
import { RunsPage } from '../../features/runs/runs-page';
import { RequirePermission } from '../../features/access/require-permission';
import { prefetchFor } from './prefetch';

export function loader() {
  return prefetchFor('runs:read', runsQueryOptions(), groupsQueryOptions(), outcomesQueryOptions());
}

export function Component() {
  return <RequirePermission permission="runs:read">{(user) => <RunsPage user={user} />}</RequirePermission>;
}

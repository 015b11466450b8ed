import { hearingWorkersQueryOptions } from '../../features/hearing/api/get-hearing-workers';
import { HearingWorkersPage } from '../../features/hearing/hearing-workers-page';
import { RequirePermission } from '../../features/access/require-permission';
import { prefetchFor } from './prefetch';

export function loader() {
  return prefetchFor('cases:read', hearingWorkersQueryOptions());
}

export function Component() {
  return <RequirePermission permission="cases:read">{() => <HearingWorkersPage />}</RequirePermission>;
}

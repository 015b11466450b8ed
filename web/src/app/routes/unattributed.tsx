import { outcomesQueryOptions } from '../../api/get-outcomes';
import { unattributedQueryOptions } from '../../features/runs/api/get-unattributed';
import { UnattributedPage } from '../../features/runs/unattributed-page';
import { RequirePermission } from '../../features/access/require-permission';
import { prefetchFor } from './prefetch';

export function loader() {
  return prefetchFor('cases:read', unattributedQueryOptions(), outcomesQueryOptions());
}

export function Component() {
  return <RequirePermission permission="cases:read">{() => <UnattributedPage />}</RequirePermission>;
}

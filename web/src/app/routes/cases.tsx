import { groupsQueryOptions } from '../../api/get-groups';
import { outcomesQueryOptions } from '../../api/get-outcomes';
import { sitesQueryOptions } from '../../api/get-sites';
import { CasesPage } from '../../features/cases/cases-page';
import { RequirePermission } from '../../features/access/require-permission';
import { prefetchFor } from './prefetch';

export function loader() {
  return prefetchFor('cases:read', outcomesQueryOptions(), groupsQueryOptions(), sitesQueryOptions());
}

export function Component() {
  return <RequirePermission permission="cases:read">{() => <CasesPage />}</RequirePermission>;
}

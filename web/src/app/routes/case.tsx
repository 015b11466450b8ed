import { useParams } from 'react-router';
import { groupsQueryOptions } from '../../api/get-groups';
import { sitesQueryOptions } from '../../api/get-sites';
import { CasePage } from '../../features/cases/case-page';
import { RequirePermission } from '../../features/access/require-permission';
import { prefetchFor } from './prefetch';

export function loader() {
  return prefetchFor('cases:read', groupsQueryOptions(), sitesQueryOptions());
}

export function Component() {
  const { ref } = useParams();
  return <RequirePermission permission="cases:read">{() => <CasePage caseRef={ref!} />}</RequirePermission>;
}

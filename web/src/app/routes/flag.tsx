import { useParams, type LoaderFunctionArgs } from 'react-router';
import { flagQueryOptions } from '../../features/flags/api/get-flag';
import { FlagDetailPage } from '../../features/flags/flag-detail-page';
import { outcomesQueryOptions } from '../../api/get-outcomes';
import { sitesQueryOptions } from '../../api/get-sites';
import { RequirePermission } from '../../features/access/require-permission';
import { prefetchFor } from './prefetch';

export function loader({ params }: LoaderFunctionArgs) {
  return prefetchFor('flags:read', flagQueryOptions(params.id!), outcomesQueryOptions(), sitesQueryOptions());
}

export function Component() {
  const { id } = useParams();
  return <RequirePermission permission="flags:read">{(user) => <FlagDetailPage id={id!} user={user} />}</RequirePermission>;
}

import { useParams, type LoaderFunctionArgs } from 'react-router';
import { hearingWorkerQueryOptions } from '../../features/hearing/api/get-hearing-worker';
import { HearingWorkerPage } from '../../features/hearing/hearing-worker-page';
import { RequirePermission } from '../../features/access/require-permission';
import { prefetchFor } from './prefetch';

export function loader({ params }: LoaderFunctionArgs) {
  return prefetchFor('cases:read', hearingWorkerQueryOptions(String(params.workerKey)));
}

export function Component() {
  const { workerKey } = useParams();
  return <RequirePermission permission="cases:read">{() => <HearingWorkerPage workerKey={String(workerKey)} />}</RequirePermission>;
}

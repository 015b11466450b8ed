import { clientsQueryOptions } from '../../features/admin/api/get-clients';
import { ClientsPage } from '../../features/admin/clients-page';
import { RequirePermission } from '../../features/access/require-permission';
import { prefetchFor } from './prefetch';

export function loader() {
  return prefetchFor('clients:manage', clientsQueryOptions());
}

export function Component() {
  return <RequirePermission permission="clients:manage">{() => <ClientsPage />}</RequirePermission>;
}

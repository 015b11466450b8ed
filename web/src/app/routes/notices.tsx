import { NoticesPage } from '../../features/notices/notices-page';
import { RequirePermission } from '../../features/access/require-permission';

export function Component() {
  return <RequirePermission permission="flags:read">{() => <NoticesPage />}</RequirePermission>;
}

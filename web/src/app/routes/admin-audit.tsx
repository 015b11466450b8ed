import { AuditPage } from '../../features/admin/audit-page';
import { RequirePermission } from '../../features/access/require-permission';
import { prefetchFor } from './prefetch';

export function loader() {
  return prefetchFor('audit:read');
}

export function Component() {
  return <RequirePermission permission="audit:read">{() => <AuditPage />}</RequirePermission>;
}

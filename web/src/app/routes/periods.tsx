import { periodCalendarQueryOptions } from '../../api/get-period-calendar';
import { PeriodsPage } from '../../features/periods/periods-page';
import { RequirePermission } from '../../features/access/require-permission';
import { prefetchFor } from './prefetch';

export function loader() {
  return prefetchFor('periods:read', periodCalendarQueryOptions());
}

export function Component() {
  return <RequirePermission permission="periods:read">{(user) => <PeriodsPage user={user} />}</RequirePermission>;
}

import { RequirePermission } from '../../features/access/require-permission';
import { intakesQueryOptions } from '../../features/intakes/api/get-intakes';
import { IntakesPage } from '../../features/intakes/intakes-page';
import { sessionQueryOptions } from '../../api/get-session';
import { queryClient } from '../query-client';
import { roleMay } from '@ratewarden/shared/permissions';

/** Prefetch only what the reader's role may read; the page itself says when they may not. */
export async function loader() {
  const session = await queryClient.ensureQueryData(sessionQueryOptions());
  if (roleMay(session.user?.role, 'intake:read')) await queryClient.ensureQueryData(intakesQueryOptions({ offset: 0 }));
  return null;
}

export function Component() {
  return <RequirePermission permission="intake:read">{(user) => <IntakesPage user={user} />}</RequirePermission>;
}

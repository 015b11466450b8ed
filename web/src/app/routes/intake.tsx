import { roleMay } from '@ratewarden/shared/permissions';
import { useParams, type LoaderFunctionArgs } from 'react-router';
import { RequirePermission } from '../../features/access/require-permission';
import { intakeQueryOptions } from '../../features/intakes/api/get-intake';
import { IntakeDetailPage } from '../../features/intakes/intake-detail-page';
import { sessionQueryOptions } from '../../api/get-session';
import { queryClient } from '../query-client';

export async function loader({ params }: LoaderFunctionArgs) {
  const session = await queryClient.ensureQueryData(sessionQueryOptions());
  if (roleMay(session.user?.role, 'intake:read')) await queryClient.ensureQueryData(intakeQueryOptions(params.id!));
  return null;
}

export function Component() {
  const { id } = useParams();
  return <RequirePermission permission="intake:read">{(user) => <IntakeDetailPage id={id!} user={user} />}</RequirePermission>;
}

import { useSuspenseQuery } from '@tanstack/react-query';
import { NoRolePage } from '../../features/access/no-role-page';
import { sessionQueryOptions } from '../../api/get-session';

export function Component() {
  const { data } = useSuspenseQuery(sessionQueryOptions());
  return <NoRolePage name={data.user?.name} />;
}

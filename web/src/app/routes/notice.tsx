import { useParams } from 'react-router';
import { NoticePage } from '../../features/notices/notice-page';
import { RequirePermission } from '../../features/access/require-permission';

export function Component() {
  const { id } = useParams();
  return <RequirePermission permission="flags:read">{() => <NoticePage id={id!} />}</RequirePermission>;
}

import { groupsQueryOptions } from '../../api/get-groups';
import { outcomesQueryOptions } from '../../api/get-outcomes';
import { rulesQueryOptions } from '../../features/rules/api/get-rules';
import { RulesPage } from '../../features/rules/rules-page';
import { RequirePermission } from '../../features/access/require-permission';
import { prefetchFor } from './prefetch';

export function loader() {
  return prefetchFor('rules:read', rulesQueryOptions(), outcomesQueryOptions(), groupsQueryOptions());
}

export function Component() {
  return <RequirePermission permission="rules:read">{(user) => <RulesPage user={user} />}</RequirePermission>;
}

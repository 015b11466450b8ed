import { groupsQueryOptions } from '../../features/groups/api/get-groups';
import { outcomesQueryOptions } from '../../features/groups/api/get-outcomes';
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

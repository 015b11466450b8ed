import { groupsQueryOptions } from '../../api/get-groups';
import { outcomesQueryOptions } from '../../api/get-outcomes';
import { RuleEditorPage } from '../../features/rules/rule-editor-page';
import { RequirePermission } from '../../features/access/require-permission';
import { prefetchFor } from './prefetch';

export function loader() {
  return prefetchFor('rules:write', outcomesQueryOptions(), groupsQueryOptions());
}

export function Component() {
  return <RequirePermission permission="rules:write">{(user) => <RuleEditorPage rule={null} user={user} />}</RequirePermission>;
}

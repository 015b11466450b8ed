import type { SessionUser } from '@ratewarden/shared/session';
import { useParams, type LoaderFunctionArgs } from 'react-router';
import { groupsQueryOptions } from '../../api/get-groups';
import { outcomesQueryOptions } from '../../api/get-outcomes';
import { ruleQueryOptions, useRule } from '../../features/rules/api/get-rule';
import { RuleEditorPage } from '../../features/rules/rule-editor-page';

function RuleEditor({ id, user }: { id: string; user: SessionUser }) {
  const { data } = useRule(id);
  return <RuleEditorPage key={data.updatedAt} rule={data} user={user} />;
}
import { RequirePermission } from '../../features/access/require-permission';
import { prefetchFor } from './prefetch';

export function loader({ params }: LoaderFunctionArgs) {
  return prefetchFor('rules:read', ruleQueryOptions(params.id!), outcomesQueryOptions(), groupsQueryOptions());
}

export function Component() {
  const { id } = useParams();
  return <RequirePermission permission="rules:read">{(user) => <RuleEditor id={id!} user={user} />}</RequirePermission>;
}

import { roleLabels } from '@ratewarden/shared/domain';
import { roleMay, type Permission } from '@ratewarden/shared/permissions';
import type { SessionUser } from '@ratewarden/shared/session';
import { useSuspenseQuery } from '@tanstack/react-query';
import type { ReactNode } from 'react';
import { ProblemNotice } from '../../components/feedback/problem-notice';
import { sessionQueryOptions } from '../../api/get-session';
import { NoRolePage } from './no-role-page';
import { SignInNeeded } from './sign-in-needed';

/**
 * Shows its children only to a signed-in person whose role has `permission`. This is a courtesy
 * to the reader, not a protection: every API route checks the same permission on the server.
 */
export function RequirePermission({ permission, children }: { permission: Permission; children: (user: SessionUser) => ReactNode }) {
  const { data: session } = useSuspenseQuery(sessionQueryOptions());
  const user = session.user;
  if (!user) return <SignInNeeded />;
  if (!user.role) return <NoRolePage name={user.name} />;
  if (!roleMay(user.role, permission)) {
    return (
      <ProblemNotice
        title="Not part of your role"
        problem={{ code: 'forbidden', message: `The ${roleLabels[user.role].toLowerCase()} role does not include this page.` }}
      />
    );
  }
  return <>{children(user)}</>;
}

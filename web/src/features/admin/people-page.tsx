import { roleLabels } from '@ratewarden/shared/domain';
import type { AdminUser } from '@ratewarden/shared/admin';
import { userInviteSchema } from '@ratewarden/shared/admin';
import { useState } from 'react';
import { ProblemNotice } from '../../components/feedback/problem-notice';
import { problemOf } from '../../components/feedback/route-error';
import { TextField } from '../../components/form/text-field';
import { ResultTable } from '../../components/table/result-table';
import { formatWhen } from '../../lib/dates';
import { useSites } from '../../api/get-sites';
import { useInviteUser, useUpdateUserAccess, useUsers } from './api/get-users';
import { AdminTabs } from './admin-tabs';
import { UserAccessFields, type Access } from './user-access-form';

function EditAccess({ user, onDone }: { user: AdminUser; onDone: () => void }) {
  const { data: sites } = useSites();
  const [access, setAccess] = useState<Access>({ role: user.role, siteIds: user.siteIds });
  const update = useUpdateUserAccess();
  return (
    <form
      className="mt-2 form-panel p-3"
      aria-label={`Access of ${user.email}`}
      onSubmit={(e) => {
        e.preventDefault();
        update.mutate({ id: user.id, body: access }, { onSuccess: onDone });
      }}
    >
      <UserAccessFields value={access} onChange={setAccess} sites={sites} legend={`Role and sites of ${user.email}`} />
      {update.isError && <ProblemNotice title="Not saved" problem={problemOf(update.error).problem} />}
      <div className="mt-3 flex gap-3">
        <button type="submit" disabled={update.isPending} className="btn btn-primary px-3 py-1.5 text-sm">
          Save access
        </button>
        <button type="button" onClick={onDone} className="btn btn-quiet px-3 py-1.5 text-sm">
          Cancel
        </button>
      </div>
    </form>
  );
}

function InviteForm() {
  const { data: sites } = useSites();
  const invite = useInviteUser();
  const [email, setEmail] = useState('');
  const [name, setName] = useState('');
  const [access, setAccess] = useState<Access>({ role: null, siteIds: [] });
  const [errors, setErrors] = useState<Record<string, string>>({});
  return (
    <form
      aria-label="Add a person"
      className="mt-8 card p-4"
      onSubmit={(e) => {
        e.preventDefault();
        const parsed = userInviteSchema.safeParse({ email, name, ...access });
        if (!parsed.success) {
          setErrors(Object.fromEntries(parsed.error.issues.map((i) => [String(i.path[0]), i.message])));
          return;
        }
        setErrors({});
        invite.mutate(parsed.data, {
          onSuccess: () => {
            setEmail('');
            setName('');
            setAccess({ role: null, siteIds: [] });
          },
        });
      }}
    >
      <h2 className="text-xl font-semibold">Add a person</h2>
      <p className="mt-1 text-sm text-ink-soft">They get this access the first time they sign in with this work e-mail.</p>
      <div className="mt-3 grid gap-4 sm:grid-cols-2">
        <TextField label="Work e-mail" type="email" value={email} onChange={(e) => setEmail(e.target.value)} error={errors.email} />
        <TextField label="Name" value={name} onChange={(e) => setName(e.target.value)} error={errors.name} />
      </div>
      <div className="mt-3">
        <UserAccessFields value={access} onChange={setAccess} sites={sites} legend="Role and sites of the new person" />
      </div>
      {invite.isError && (
        <div className="mt-3">
          <ProblemNotice title="The person was not added" problem={problemOf(invite.error).problem} />
        </div>
      )}
      <button type="submit" disabled={invite.isPending} className="btn btn-primary mt-4 px-4 py-2">
        Add the person
      </button>
    </form>
  );
}

export function PeoplePage() {
  const { data: users } = useUsers();
  const { data: sites } = useSites();
  const [editing, setEditing] = useState<string | null>(null);
  const siteNames = (ids: number[]) => (ids.length ? ids.map((id) => sites.find((s) => s.id === id)?.name ?? id).join(', ') : 'none');
  return (
    <section>
      <h1 className="text-2xl font-bold tracking-tight">Administration</h1>
      <AdminTabs />
      <ResultTable
        caption={`People (${users.length})`}
        columns={['Person', 'Role', 'Sites', 'Last sign-in', 'Access']}
        exportName="people"
        rows={users.map((u) => ({
          key: u.id,
          cells: [
            <>
              <span className="font-medium">{u.name}</span>
              <span className="block text-xs text-ink-soft">{u.email}</span>
            </>,
            u.role ? roleLabels[u.role] : 'no role',
            siteNames(u.siteIds),
            u.signedUp ? formatWhen(u.lastSignInAt) : 'not signed in yet',
            editing === u.id ? (
              <EditAccess user={u} onDone={() => setEditing(null)} />
            ) : (
              <button type="button" onClick={() => setEditing(u.id)} className="text-accent underline">
                Change<span className="sr-only"> the access of {u.email}</span>
              </button>
            ),
          ],
          csv: [u.email, u.role ?? '', siteNames(u.siteIds), u.lastSignInAt, ''],
        }))}
      />
      <InviteForm />
    </section>
  );
}

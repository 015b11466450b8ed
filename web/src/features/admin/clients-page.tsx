import { clientRegistrationSchema } from '@ratewarden/shared/admin';
import { useState } from 'react';
import { ProblemNotice } from '../../components/feedback/problem-notice';
import { problemOf } from '../../components/feedback/route-error';
import { TextField } from '../../components/form/text-field';
import { StateTag } from '../../components/status/state-tag';
import { ResultTable } from '../../components/table/result-table';
import { formatWhen } from '../../lib/dates';
import { AdminTabs } from './admin-tabs';
import { useClients, useRegisterClient, useRevokeClient } from './api/get-clients';

/** Machines (an HR system) that push rosters with a client-credentials token: intake only. */
export function ClientsPage() {
  const { data: clients } = useClients();
  const register = useRegisterClient();
  const revoke = useRevokeClient();
  const [clientId, setClientId] = useState('');
  const [name, setName] = useState('');
  const [errors, setErrors] = useState<Record<string, string>>({});
  return (
    <section>
      <h1 className="text-2xl font-bold tracking-tight">Administration</h1>
      <AdminTabs />
      <p className="mt-4 max-w-3xl text-ink-soft">
        An integration client may only push intakes. The identity provider issues its credentials; registering it here lets Ratewarden accept its tokens,
        revoking it stops them at once.
      </p>
      {revoke.isError && <ProblemNotice title="Not revoked" problem={problemOf(revoke.error).problem} />}
      <ResultTable
        caption={`Integration clients (${clients.length})`}
        columns={['Client', 'Name', 'Registered', 'State', 'Action']}
        exportName="integration-clients"
        rows={clients.map((c) => ({
          key: c.clientId,
          cells: [
            <code className="font-mono">{c.clientId}</code>,
            c.name,
            formatWhen(c.registeredAt),
            c.revokedAt ? <StateTag text={`revoked ${formatWhen(c.revokedAt)}`} tone="muted" /> : <StateTag text="active" tone="good" />,
            c.revokedAt ? (
              '—'
            ) : (
              <button
                type="button"
                disabled={revoke.isPending}
                className="text-alarm underline"
                onClick={() => window.confirm(`Revoke ${c.clientId}? Its tokens stop working at once.`) && revoke.mutate(c.clientId)}
              >
                Revoke<span className="sr-only"> {c.clientId}</span>
              </button>
            ),
          ],
          csv: [c.clientId, c.name, c.registeredAt, c.revokedAt ? `revoked ${c.revokedAt}` : 'active', ''],
        }))}
      />
      <form
        aria-label="Register a client"
        className="mt-8 grid max-w-3xl gap-4 card p-4 sm:grid-cols-2"
        onSubmit={(e) => {
          e.preventDefault();
          const parsed = clientRegistrationSchema.safeParse({ clientId, name });
          if (!parsed.success) {
            setErrors(Object.fromEntries(parsed.error.issues.map((i) => [String(i.path[0]), i.message])));
            return;
          }
          setErrors({});
          register.mutate(parsed.data, {
            onSuccess: () => {
              setClientId('');
              setName('');
            },
          });
        }}
      >
        <h2 className="text-xl font-semibold sm:col-span-2">Register a client</h2>
        <TextField
          label="Client ID"
          value={clientId}
          onChange={(e) => setClientId(e.target.value)}
          error={errors.clientId}
          hint="as the identity provider knows it"
        />
        <TextField label="Name" value={name} onChange={(e) => setName(e.target.value)} error={errors.name} />
        {register.isError && (
          <div className="sm:col-span-2">
            <ProblemNotice title="Not registered" problem={problemOf(register.error).problem} />
          </div>
        )}
        <div>
          <button type="submit" disabled={register.isPending} className="btn btn-primary px-4 py-2">
            Register
          </button>
        </div>
      </form>
    </section>
  );
}

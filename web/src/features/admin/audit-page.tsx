import { useState } from 'react';
import { QueryState } from '../../components/feedback/query-state';
import { TextField } from '../../components/form/text-field';
import { ResultTable } from '../../components/table/result-table';
import { formatWhen } from '../../lib/dates';
import { AdminTabs } from './admin-tabs';
import { useAudit, type AuditFilters } from './api/get-audit';

/** Who did what and when: every sign-in, change, decision and case-level read. */
export function AuditPage() {
  const [draft, setDraft] = useState<AuditFilters>({});
  const [filters, setFilters] = useState<AuditFilters>({});
  const audit = useAudit(filters);
  return (
    <section>
      <h1 className="text-2xl font-bold tracking-tight">Administration</h1>
      <AdminTabs />
      <form
        aria-label="Filter the audit log"
        className="no-print mt-4 flex flex-wrap items-end gap-4 card p-3"
        onSubmit={(e) => {
          e.preventDefault();
          setFilters({ ...draft });
        }}
      >
        <TextField label="Action" placeholder="e.g. flag.close" value={draft.action ?? ''} onChange={(e) => setDraft({ ...draft, action: e.target.value || undefined })} />
        <TextField label="Actor" placeholder="e-mail or client" value={draft.actor ?? ''} onChange={(e) => setDraft({ ...draft, actor: e.target.value || undefined })} />
        <TextField label="From" type="date" value={draft.from ?? ''} onChange={(e) => setDraft({ ...draft, from: e.target.value || undefined })} />
        <TextField label="To" type="date" value={draft.to ?? ''} onChange={(e) => setDraft({ ...draft, to: e.target.value || undefined })} />
        <button type="submit" className="btn btn-primary px-4 py-2">Show</button>
      </form>
      <QueryState query={audit} label="audit log">
        {(events) => (
          <>
            <ResultTable
              caption={`Audit events (${events.length}${events.length === 200 ? ', the newest 200' : ''})`}
              columns={['When', 'Actor', 'Action', 'Target', 'Detail', 'Address']}
              exportName="audit-log"
              rows={events.map((e) => ({
                key: String(e.id),
                cells: [formatWhen(e.at), e.actor, <code className="font-mono text-xs">{e.action}</code>, e.target ?? '—', <code className="block max-w-md truncate font-mono text-xs" title={JSON.stringify(e.detail)}>{JSON.stringify(e.detail)}</code>, e.ip ?? '—'],
                csv: [e.at, e.actor, e.action, e.target, JSON.stringify(e.detail), e.ip],
              }))}
            />
            {events.length === 200 && (
              <button type="button" className="mt-3 text-accent underline" onClick={() => setFilters({ ...filters, before: events[events.length - 1]!.id })}>
                Older events
              </button>
            )}
          </>
        )}
      </QueryState>
    </section>
  );
}

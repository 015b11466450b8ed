import { auditActionLabels, auditActionWords, auditTargetKinds } from '@ratewarden/shared/audit-actions';
import { useState } from 'react';
import { QueryState } from '../../components/feedback/query-state';
import { SelectField } from '../../components/form/select-field';
import { TextField } from '../../components/form/text-field';
import { ResultTable } from '../../components/table/result-table';
import { formatWhen } from '../../lib/dates';
import { AdminTabs } from './admin-tabs';
import { useAudit, type AuditFilters } from './api/get-audit';
import { AuditDetail } from './audit-detail';
import { auditRange, auditWhenOptions, auditWhenWords, type AuditWhen } from './audit-when';

interface Draft {
  person: string;
  action: string;
  when: AuditWhen;
  from: string;
  to: string;
}

const empty: Draft = { person: '', action: '', when: 'any', from: '', to: '' };
const today = () => new Date().toISOString().slice(0, 10);

function toFilters(d: Draft): AuditFilters {
  return {
    ...(d.person.trim() ? { actor: d.person.trim() } : {}),
    ...(d.action ? { action: d.action } : {}),
    ...auditRange(d.when, today(), { from: d.from || undefined, to: d.to || undefined }),
  };
}

function sentence(d: Draft): string {
  const what = d.action ? `“${auditActionWords(d.action)}”` : 'every action';
  const who = d.person.trim() ? ` by people matching “${d.person.trim()}”` : ' by anyone';
  return `Showing ${what}${who}, ${auditWhenWords(d.when, { from: d.from || undefined, to: d.to || undefined })}, newest first.`;
}

/** The target as people name it: "person: Ines Okafor", else its kind and reference. */
function targetWords(target: string | null, name: string | null): string {
  if (!target) return '—';
  const [kind, ...rest] = target.split(':');
  const kindWords = auditTargetKinds[kind!] ?? kind!;
  return `${kindWords}: ${name ?? rest.join(':')}`;
}

/** Who did what and when: every sign-in, change, decision and case-level read, in words. */
export function AuditPage() {
  const [draft, setDraft] = useState<Draft>(empty);
  const [applied, setApplied] = useState<Draft>(empty);
  const [before, setBefore] = useState<number | undefined>(undefined);
  const audit = useAudit({ ...toFilters(applied), ...(before ? { before } : {}) });
  const actionOptions = [
    { value: '', label: 'Any action' },
    ...Object.entries(auditActionLabels)
      .map(([value, label]) => ({ value, label }))
      .sort((a, b) => a.label.localeCompare(b.label)),
  ];
  return (
    <section>
      <h1 className="text-2xl font-bold tracking-tight">Administration</h1>
      <AdminTabs />
      <form
        aria-label="Filter the audit log"
        className="no-print mt-4 flex flex-wrap items-end gap-4 card p-3"
        onSubmit={(e) => {
          e.preventDefault();
          setBefore(undefined);
          setApplied({ ...draft });
        }}
      >
        <TextField
          label="Person"
          hint="part of a name, e-mail or client"
          value={draft.person}
          onChange={(e) => setDraft({ ...draft, person: e.target.value })}
        />
        <SelectField label="Action" value={draft.action} onChange={(e) => setDraft({ ...draft, action: e.target.value })} options={actionOptions} />
        <SelectField label="When" value={draft.when} onChange={(e) => setDraft({ ...draft, when: e.target.value as AuditWhen })} options={auditWhenOptions} />
        {draft.when === 'chosen' && (
          <>
            <TextField label="From the day" type="date" value={draft.from} onChange={(e) => setDraft({ ...draft, from: e.target.value })} />
            <TextField label="Up to the day" type="date" value={draft.to} onChange={(e) => setDraft({ ...draft, to: e.target.value })} />
          </>
        )}
        <button type="submit" className="btn btn-primary px-4 py-2">
          Show
        </button>
      </form>
      <p className="mt-3 text-sm text-ink-soft" role="status">
        {sentence(applied)}
      </p>
      <QueryState query={audit} label="audit log">
        {(events) => (
          <>
            <ResultTable
              caption={`Audit events (${events.length}${events.length === 200 ? ', the newest 200' : ''})`}
              columns={['When', 'Who', 'What', 'On what', 'Details', 'Address']}
              exportName="audit-log"
              rows={events.map((e) => ({
                key: String(e.id),
                cells: [
                  <span className="whitespace-nowrap">{formatWhen(e.at)}</span>,
                  <>
                    <span className="font-medium">{e.actorName ?? (e.actor.startsWith('client:') ? `client ${e.actor.slice(7)}` : e.actor)}</span>
                    {e.actorName && e.actorName !== e.actor && <span className="block text-xs text-ink-soft">{e.actor}</span>}
                  </>,
                  auditActionWords(e.action),
                  targetWords(e.target, e.targetName),
                  <AuditDetail detail={e.detail} />,
                  e.ip ?? '—',
                ],
                csv: [e.at, e.actorName ?? '', e.actor, e.action, auditActionWords(e.action), e.target, e.targetName, JSON.stringify(e.detail), e.ip],
              }))}
              csvColumns={['When', 'Person', 'Account', 'Action code', 'Action', 'Target', 'Target name', 'Detail', 'Address']}
            />
            {events.length === 200 && (
              <button type="button" className="btn btn-quiet mt-3 px-3 py-1.5 text-sm" onClick={() => setBefore(events[events.length - 1]!.id)}>
                Older events
              </button>
            )}
          </>
        )}
      </QueryState>
    </section>
  );
}

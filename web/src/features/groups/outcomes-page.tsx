import { roleMay } from '@ratewarden/shared/permissions';
import type { SessionUser } from '@ratewarden/shared/session';
import { useState } from 'react';
import { ResultTable } from '../../components/table/result-table';
import { useGroups } from '../../api/get-groups';
import { useOutcomes } from '../../api/get-outcomes';
import { OutcomeForm } from './outcome-form';

/** Health outcomes with their case definitions, counting rule, lag and reference group. */
export function OutcomesPage({ user }: { user: SessionUser }) {
  const { data: outcomes } = useOutcomes();
  const { data: groups } = useGroups();
  const [editing, setEditing] = useState<number | 'new' | null>(null);
  const canWrite = roleMay(user.role, 'groups:write');
  const globalRef = groups.find((g) => g.isReference)?.name ?? 'none set';
  return (
    <section>
      <h1 className="text-2xl font-bold tracking-tight">Outcomes</h1>
      <p className="mt-2 max-w-3xl text-ink-soft">
        What counts as a case of each outcome, whether a worker can count more than once, and which group it is compared with.
      </p>
      <ResultTable
        caption={`Outcomes (${outcomes.length})`}
        columns={['Outcome', 'Case definition', 'Counting', 'Lag', 'Reference group', ...(canWrite ? ['Change'] : [])]}
        exportName="outcomes"
        rows={outcomes.map((o) => {
          const ref = o.referenceGroupId ? (groups.find((g) => g.id === o.referenceGroupId)?.name ?? String(o.referenceGroupId)) : `${globalRef} (global)`;
          return {
            key: String(o.id),
            cells: [
              <>
                <span className="font-medium">{o.name}</span> <code className="font-mono text-xs">{o.code}</code>
                {editing === o.id && <OutcomeForm outcome={o} groups={groups} onDone={() => setEditing(null)} />}
              </>,
              <span className="text-sm">{o.caseDefinition}</span>,
              o.countingRule === 'first_event' ? 'first event only' : 'recurrent',
              `${o.lagMonths} months`,
              ref,
              ...(canWrite
                ? [
                    <button type="button" className="text-accent underline" onClick={() => setEditing(o.id)}>
                      Edit<span className="sr-only"> {o.name}</span>
                    </button>,
                  ]
                : []),
            ],
            csv: [o.name, o.caseDefinition, o.countingRule, o.lagMonths, ref, ...(canWrite ? [''] : [])],
          };
        })}
      />
      {canWrite &&
        (editing === 'new' ? (
          <OutcomeForm outcome={null} groups={groups} onDone={() => setEditing(null)} />
        ) : (
          <button type="button" className="btn btn-primary mt-4 px-4 py-2" onClick={() => setEditing('new')}>
            New outcome
          </button>
        ))}
    </section>
  );
}

import { roleMay } from '@ratewarden/shared/permissions';
import type { SessionUser } from '@ratewarden/shared/session';
import { useState } from 'react';
import { ProblemNotice } from '../../components/feedback/problem-notice';
import { problemOf } from '../../components/feedback/route-error';
import { StateTag } from '../../components/status/state-tag';
import { ResultTable } from '../../components/table/result-table';
import { formatWhen } from '../../lib/dates';
import { useGroups } from '../../api/get-groups';
import { useSetReferenceGroup } from './api/save-group';
import { GroupForm } from './group-form';

/** Exposure groups with their hazard, ordinal exposure level and the reference group. */
export function GroupsPage({ user }: { user: SessionUser }) {
  const { data: groups } = useGroups();
  const setReference = useSetReferenceGroup();
  const [editing, setEditing] = useState<number | 'new' | null>(null);
  const canWrite = roleMay(user.role, 'groups:write');
  const sorted = [...groups].sort((a, b) => (a.exposureLevel ?? 999) - (b.exposureLevel ?? 999) || a.name.localeCompare(b.name));
  return (
    <section>
      <h1 className="text-2xl font-bold tracking-tight">Exposure groups</h1>
      <p className="mt-2 max-w-3xl text-ink-soft">
        Each group is compared with the reference group; the ordinal exposure levels order the groups for the trend test. A change applies from the next run.
      </p>
      {setReference.isError && <ProblemNotice title="The reference group was not changed" problem={problemOf(setReference.error).problem} />}
      <ResultTable
        caption={`Exposure groups (${groups.length}), by exposure level`}
        columns={['Group', 'Code', 'Hazard', 'Exposure level', 'Reference', 'Last change', ...(canWrite ? ['Change'] : [])]}
        exportName="exposure-groups"
        rows={sorted.map((g) => ({
          key: String(g.id),
          cells: [
            <>
              <span className="font-medium">{g.name}</span>
              {editing === g.id && <GroupForm group={g} onDone={() => setEditing(null)} />}
            </>,
            <code className="font-mono">{g.code}</code>,
            g.hazard,
            g.exposureLevel === null ? 'not ordered' : String(g.exposureLevel),
            g.isReference ? (
              <StateTag text="reference" tone="good" />
            ) : canWrite ? (
              <button type="button" disabled={setReference.isPending} className="text-sm text-accent underline" onClick={() => setReference.mutate(g.id)}>
                Make reference<span className="sr-only"> group: {g.name}</span>
              </button>
            ) : (
              '—'
            ),
            formatWhen(g.updatedAt),
            ...(canWrite
              ? [
                  <button type="button" className="text-accent underline" onClick={() => setEditing(g.id)}>
                    Edit<span className="sr-only"> {g.name}</span>
                  </button>,
                ]
              : []),
          ],
          csv: [g.name, g.code, g.hazard, g.exposureLevel, g.isReference ? 'reference' : '', g.updatedAt, ...(canWrite ? [''] : [])],
        }))}
      />
      {canWrite &&
        (editing === 'new' ? (
          <GroupForm group={null} onDone={() => setEditing(null)} />
        ) : (
          <button type="button" className="btn btn-primary mt-4 px-4 py-2" onClick={() => setEditing('new')}>
            New exposure group
          </button>
        ))}
    </section>
  );
}

import { roleMay } from '@ratewarden/shared/permissions';
import type { Role } from '@ratewarden/shared/domain';
import type { IntakeDetail, IntakeProblem } from '@ratewarden/shared/intake-schemas';
import type { SessionUser } from '@ratewarden/shared/session';
import { createColumnHelper } from '@tanstack/react-table';
import { Link } from 'react-router';
import { DataTable } from '../../components/table/data-table';
import { paths } from '../../config/paths';
import { isApiError } from '../../lib/api-error';
import { formatCount } from '../../lib/format';
import { useDecideIntake, type IntakeDecision } from './api/decide-intake';
import { useIntake } from './api/get-intake';
import { CaseConflicts } from './case-conflicts';
import { CaseDiffView } from './case-diff';
import { IntakeStateBadge } from './intake-state-badge';
import { RosterDiffView } from './roster-diff';
import { IntakeRunWait } from './intake-run-wait';

const when = (iso: string | null) => (iso ? new Date(iso).toLocaleString('en-GB', { dateStyle: 'medium', timeStyle: 'short' }) : '—');

const pcol = createColumnHelper<IntakeProblem>();
const problemColumns = [
  pcol.accessor((p) => p.line ?? 0, {
    id: 'line',
    header: 'Line',
    cell: (c) => (c.row.original.line === null ? 'whole file' : formatCount(c.row.original.line)),
    meta: { numeric: true, csv: (p) => p.line },
  }),
  pcol.accessor((p) => p.column ?? '', { id: 'column', header: 'Column' }),
  pcol.accessor((p) => p.value ?? '', { id: 'value', header: 'Value' }),
  pcol.accessor('reason', { header: 'Problem' }),
];

function Diff({ intake, role }: { intake: IntakeDetail; role: Role | null }) {
  const d = intake.diff;
  if (!d) return null;
  return d.kind === 'cases' ? <CaseDiffView diff={d} role={role} intakeId={intake.id} /> : <RosterDiffView diff={d} role={role} intakeId={intake.id} />;
}

export function IntakeDetailPage({ id, user }: { id: string; user: SessionUser }) {
  const { data: intake } = useIntake(id);
  const decide = useDecideIntake(id);
  const mayWrite = roleMay(user.role, 'intake:write');
  const act = (d: IntakeDecision) => decide.mutate(d);
  return (
    <section>
      <p className="text-sm">
        <Link to={paths.intakes} className="text-accent underline">
          ← All intakes
        </Link>
      </p>
      <h1 className="mt-2 flex flex-wrap items-center gap-3 text-2xl font-bold tracking-tight">
        {intake.fileName} <IntakeStateBadge state={intake.state} />
      </h1>
      <dl className="mt-4 grid grid-cols-2 gap-x-6 gap-y-1 text-sm sm:grid-cols-4">
        {[
          ['Kind', intake.kind],
          ['Rows', formatCount(intake.rowCount)],
          ['Problems', formatCount(intake.problemCount)],
          ['Months', intake.monthFrom ? `${intake.monthFrom} to ${intake.monthTo ?? intake.monthFrom}` : '—'],
          ['Received', when(intake.createdAt)],
          ['Checked', when(intake.checkedAt)],
          ['Applied', when(intake.appliedAt)],
          ['Superseded', when(intake.supersededAt)],
        ].map(([k, v]) => (
          <div key={k}>
            <dt className="text-ink-soft">{k}</dt>
            <dd className="font-medium">{v}</dd>
          </div>
        ))}
      </dl>
      {intake.runRequest && (
        <p className="mt-4 note note-ok px-4 py-2 text-sm">
          A run was requested {when(intake.runRequest.requestedAt)} ({intake.runRequest.reason});{' '}
          {!intake.runRequest.run ? (
            'the worker has not taken it up yet.'
          ) : intake.runRequest.run.state === 'running' ? (
            `run ${intake.runRequest.run.number} is computing now.`
          ) : (
            <>
              <Link className="text-accent underline" to={paths.runs}>
                run {intake.runRequest.run.number}
              </Link>{' '}
              {intake.runRequest.run.state === 'succeeded' ? 'finished' : 'failed'} {when(intake.runRequest.run.finishedAt)}
              {intake.runRequest.run.state === 'succeeded' ? ', and its figures are the ones shown now.' : '; the previous figures stay current.'}
            </>
          )}
        </p>
      )}
      {intake.runRequest && !intake.runRequest.pickedAt && <IntakeRunWait />}
      {intake.conflictsPending && (
        <p role="status" className="mt-4 note note-alarm px-4 py-2">
          Some cases of this list contradict a physician's decision. The list can be applied once a physician has decided each of them (keep the decision or
          accept the list).
        </p>
      )}
      {intake.kind === 'cases' && intake.state !== 'rejected' && roleMay(user.role, 'cases:review') && <CaseConflicts intake={intake} />}
      {mayWrite && (
        <div className="no-print mt-6 flex flex-wrap gap-3">
          {intake.state === 'checked' && intake.staged && (
            <>
              <button type="button" disabled={decide.isPending} onClick={() => act('apply')} className="btn btn-primary px-5 py-2">
                Apply this intake
              </button>
              <button type="button" disabled={decide.isPending} onClick={() => act('discard')} className="btn btn-danger px-5 py-2">
                Discard it
              </button>
            </>
          )}
          {intake.state === 'superseded' && (
            <button type="button" disabled={decide.isPending} onClick={() => act('restore')} className="btn btn-quiet px-5 py-2">
              Restore this version
            </button>
          )}
        </div>
      )}
      {decide.error && (
        <p role="alert" className="mt-3 note note-alarm px-4 py-2">
          {isApiError(decide.error) ? decide.error.problem.message : String(decide.error)}
        </p>
      )}
      <Diff intake={intake} role={user.role} />
      {intake.problems.length > 0 && (
        <section className="mt-6">
          <DataTable
            caption={`Problems (${formatCount(intake.problemCount)}${intake.problemCount > intake.problems.length ? `, the first ${formatCount(intake.problems.length)} shown` : ''})`}
            columns={problemColumns}
            data={intake.problems}
            exportName={`intake-${intake.id}-problems`}
            rowHeader="line"
          />
        </section>
      )}
    </section>
  );
}

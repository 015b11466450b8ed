import { roleMay } from '@ratewarden/shared/permissions';
import type { WatchRule } from '@ratewarden/shared/rules';
import type { SessionUser } from '@ratewarden/shared/session';
import { createColumnHelper } from '@tanstack/react-table';
import { Link } from 'react-router';
import { StateTag } from '../../components/status/state-tag';
import { DataTable } from '../../components/table/data-table';
import { paths } from '../../config/paths';
import { formatWhen } from '../../lib/dates';
import { formatEstimate } from '../../lib/format';
import { useGroups } from '../../api/get-groups';
import { useOutcomes } from '../../api/get-outcomes';
import { useSites } from '../../api/get-sites';
import { useRules } from './api/get-rules';
import { describeRule } from './describe-rule';

type Row = WatchRule & { outcomeName: string; groupName: string; scopeName: string; sentence: string };
const col = createColumnHelper<Row>();
const columns = [
  col.accessor('name', {
    header: 'Watch rule',
    cell: (c) => (
      <Link className="font-medium text-accent underline" to={paths.rule(c.row.original.id)}>
        {c.getValue()}
      </Link>
    ),
  }),
  col.accessor('outcomeName', { header: 'Outcome' }),
  col.accessor('groupName', { header: 'Groups' }),
  col.accessor('scopeName', { header: 'Watches' }),
  col.accessor('sentence', { header: 'Raises a flag when', enableSorting: false }),
  col.accessor('threshold', {
    header: 'Threshold',
    cell: (c) => (c.getValue() === null ? 'upper limit' : formatEstimate(c.getValue())),
    meta: { numeric: true },
  }),
  col.accessor('active', {
    header: 'Active',
    cell: (c) => <StateTag text={c.getValue() ? 'active' : 'paused'} tone={c.getValue() ? 'good' : 'muted'} />,
    meta: { csv: (r) => (r.active ? 'active' : 'paused') },
  }),
  col.accessor('updatedAt', { header: 'Last change', cell: (c) => formatWhen(c.getValue()) }),
];

export function RulesPage({ user }: { user: SessionUser }) {
  const { data: rules } = useRules();
  const { data: outcomes } = useOutcomes();
  const { data: groups } = useGroups();
  const { data: sites } = useSites();
  const rows: Row[] = rules.map((r) => ({
    ...r,
    outcomeName: outcomes.find((o) => o.id === r.outcomeId)?.name ?? `outcome ${r.outcomeId}`,
    groupName:
      r.exposureGroupId === null ? 'every group but the reference' : (groups.find((g) => g.id === r.exposureGroupId)?.name ?? `group ${r.exposureGroupId}`),
    scopeName: r.siteIds === null ? 'the whole company' : r.siteIds.map((id) => sites.find((s) => s.id === id)?.name ?? `site ${id}`).join(', '),
    sentence: describeRule(r),
  }));
  return (
    <section>
      <h1 className="text-2xl font-bold tracking-tight">Watch rules</h1>
      <p className="mt-2 max-w-3xl text-ink-soft">
        After every run each active rule is checked against the new results, the company's or each chosen site's own; where it holds, a flag is raised (or
        updated) and the recipients get a threshold notice. When a later run withdraws a worsening or finds a flag no longer past its rule, they get a
        follow-up.
      </p>
      {roleMay(user.role, 'rules:write') && (
        <p className="mt-4">
          <Link to={paths.ruleNew} className="btn btn-primary inline-block px-4 py-2">
            New watch rule
          </Link>
        </p>
      )}
      <DataTable caption={`Watch rules (${rows.length})`} columns={columns} data={rows} exportName="watch-rules" rowHeader="name" />
    </section>
  );
}

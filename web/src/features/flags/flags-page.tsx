import { flagStateSchema, type Flag, type FlagState } from '@ratewarden/shared/flags';
import { createColumnHelper } from '@tanstack/react-table';
import { Link, useSearchParams } from 'react-router';
import { Cautions } from '../../components/cautions/cautions';
import { SelectField } from '../../components/form/select-field';
import { StateTag } from '../../components/status/state-tag';
import { DataTable } from '../../components/table/data-table';
import { paths } from '../../config/paths';
import { formatMonth, formatWhen } from '../../lib/dates';
import { formatEstimate } from '../../lib/format';
import { useOutcomes } from '../../api/get-outcomes';
import { useFlags } from '../../api/get-flags';
import { flagStateLabels, measureLabels } from './flag-labels';

const col = createColumnHelper<Flag & { outcomeName: string }>();
const columns = [
  col.accessor('exposureGroupName', {
    header: 'Exposure group',
    cell: (c) => (
      <Link className="font-medium text-accent underline" to={paths.flag(c.row.original.id)}>
        {c.getValue()}
      </Link>
    ),
  }),
  col.accessor('outcomeName', { header: 'Outcome' }),
  col.accessor((f) => f.siteName ?? 'Whole company', { id: 'site', header: 'Site' }),
  col.accessor('ruleName', { header: 'Watch rule' }),
  col.accessor('state', { header: 'State', cell: (c) => <StateTag {...flagStateLabels[c.getValue()]} />, meta: { csv: (f) => flagStateLabels[f.state].text } }),
  col.accessor('period', {
    header: 'Period',
    cell: (c) => `${c.row.original.figures.window === 'rolling12' ? '12 months to ' : ''}${formatMonth(c.getValue())}`,
  }),
  col.accessor('value', {
    header: 'Value',
    cell: (c) =>
      c.row.original.figures.suppressed ? (
        'not shown (small count)'
      ) : (
        <span title={measureLabels[c.row.original.figures.measure]}>{formatEstimate(c.getValue())}</span>
      ),
    meta: { numeric: true },
  }),
  col.accessor((f) => f.figures.threshold, { id: 'threshold', header: 'Threshold', cell: (c) => formatEstimate(c.getValue()), meta: { numeric: true } }),
  col.accessor('raisedAt', { header: 'Raised', cell: (c) => formatWhen(c.getValue()) }),
  col.accessor('updatedAt', { header: 'Last change', cell: (c) => formatWhen(c.getValue()) }),
];

export function FlagsPage() {
  const [params, setParams] = useSearchParams();
  const parsedState = flagStateSchema.safeParse(params.get('state'));
  const state: FlagState | undefined = parsedState.success ? parsedState.data : undefined;
  const outcomeId = params.get('outcome') ? Number(params.get('outcome')) : undefined;
  const { data: outcomes } = useOutcomes();
  const { data: flags } = useFlags({ state, outcomeId });
  const set = (k: string, v: string) =>
    setParams((p) => {
      const n = new URLSearchParams(p);
      if (v) n.set(k, v);
      else n.delete(k);
      return n;
    });
  const rows = flags.map((f) => ({ ...f, outcomeName: outcomes.find((o) => o.id === f.outcomeId)?.name ?? `outcome ${f.outcomeId}` }));
  return (
    <section>
      <h1 className="text-2xl font-bold tracking-tight">Flags</h1>
      <p className="mt-2 max-w-3xl text-ink-soft">
        A run raises a flag when a watch rule's threshold is crossed, on the whole company's results or on one site's own. The safety manager reviews each one
        and closes it with a reason. You see the flags of your sites, and the company's when you have every site.
      </p>
      <form aria-label="Filter the flags" className="no-print mt-5 flex flex-wrap items-end gap-4 card p-3" onSubmit={(e) => e.preventDefault()}>
        <SelectField
          label="State"
          value={state ?? ''}
          onChange={(e) => set('state', e.target.value)}
          options={[{ value: '', label: 'Any state' }, ...flagStateSchema.options.map((s) => ({ value: s, label: flagStateLabels[s].text }))]}
        />
        <SelectField
          label="Outcome"
          value={outcomeId ? String(outcomeId) : ''}
          onChange={(e) => set('outcome', e.target.value)}
          options={[{ value: '', label: 'Every outcome' }, ...outcomes.map((o) => ({ value: String(o.id), label: o.name }))]}
        />
        <Link to={paths.rules} className="ml-auto text-sm font-medium text-accent underline">
          Watch rules
        </Link>
      </form>
      <DataTable caption={`Flags (${rows.length})`} columns={columns} data={rows} exportName="flags" rowHeader="exposureGroupName" />
      <Cautions />
    </section>
  );
}

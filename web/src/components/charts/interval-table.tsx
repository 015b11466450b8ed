/** One row of an interval chart's table alternative. */
export interface IntervalRow {
  label: string;
  estimate: number | null;
  lower: number | null;
  upper: number | null;
}

/**
 * The table alternative of an interval chart (thead and tbody, for ChartFigure's table): each
 * item with its estimate and limits, written by `format` (null: not defined).
 */
export function IntervalTable({ rows, format }: { rows: IntervalRow[]; format: (v: number | null) => string }) {
  return (
    <>
      <thead>
        <tr className="border-b border-ink text-left">
          {['Item', 'Estimate', 'Lower', 'Upper'].map((h) => (
            <th key={h} scope="col" className="px-2 py-1">
              {h}
            </th>
          ))}
        </tr>
      </thead>
      <tbody>
        {rows.map((r) => (
          <tr key={r.label} className="border-b border-line">
            <th scope="row" className="px-2 py-1 text-left font-medium">
              {r.label}
            </th>
            <td className="px-2 py-1 tabular-nums">{format(r.estimate)}</td>
            <td className="px-2 py-1 tabular-nums">{format(r.lower)}</td>
            <td className="px-2 py-1 tabular-nums">{format(r.upper)}</td>
          </tr>
        ))}
      </tbody>
    </>
  );
}

import { ChartFigure } from '../../components/charts/chart-figure';
import { IntervalTable } from '../../components/charts/interval-table';
import { formatEstimate } from '../../lib/format';
import { linearAxis } from './linear-ticks';

/**
 * A difference and its interval on a linear axis in percentage points, with a dashed line at 0 (no
 * difference). The interval plot of the charts is for ratios on a log axis; a difference can be
 * negative, so it is drawn here. Values arrive as proportions; the table alternative sits beside it.
 */
const width = 480;
const height = 96;
const pad = { left: 16, right: 16, top: 18, bottom: 34 };

const points = (x: number) => `${formatEstimate(x * 100)} points`;

export function DifferencePlot({
  title,
  label,
  estimate,
  lower,
  upper,
}: {
  title: string;
  label: string;
  estimate: number | null;
  lower: number | null;
  upper: number | null;
}) {
  const values = [estimate, lower, upper].filter((v): v is number => v !== null && Number.isFinite(v)).map((v) => v * 100);
  const axis = linearAxis(values);
  const x = (v: number) => pad.left + ((v - axis.min) / (axis.max - axis.min)) * (width - pad.left - pad.right);
  const y = pad.top + 12;
  // The "no difference" label stays inside the plot when 0 sits at one end of the axis.
  const zeroAt = (0 - axis.min) / (axis.max - axis.min);
  const zeroAnchor = zeroAt < 0.15 ? 'start' : zeroAt > 0.85 ? 'end' : 'middle';
  const has = (v: number | null): v is number => v !== null && Number.isFinite(v);
  const description = `${title}. ${label}: ${estimate === null ? 'not defined' : points(estimate)}, interval ${lower === null ? 'not defined' : points(lower)} to ${upper === null ? 'not defined' : points(upper)}.`;
  return (
    <ChartFigure
      title={title}
      chart={
        <svg viewBox={`0 0 ${width} ${height}`} role="img" aria-label={description} className="mt-2 w-full max-w-xl text-ink">
          <line x1={x(0)} x2={x(0)} y1={pad.top - 6} y2={height - pad.bottom} stroke="currentColor" strokeDasharray="4 3" />
          <text x={x(0)} y={pad.top - 8} textAnchor={zeroAnchor} fontSize="11" fill="currentColor">
            no difference
          </text>
          {has(lower) && has(upper) && (
            <g stroke="currentColor" strokeWidth="2">
              <line x1={x(lower * 100)} x2={x(upper * 100)} y1={y} y2={y} />
              <line x1={x(lower * 100)} x2={x(lower * 100)} y1={y - 6} y2={y + 6} />
              <line x1={x(upper * 100)} x2={x(upper * 100)} y1={y - 6} y2={y + 6} />
            </g>
          )}
          {has(estimate) && <rect x={x(estimate * 100) - 5.5} y={y - 5.5} width="11" height="11" className="fill-accent" stroke="currentColor" />}
          <line x1={pad.left} x2={width - pad.right} y1={height - pad.bottom} y2={height - pad.bottom} stroke="currentColor" />
          {axis.ticks.map((t) => (
            <g key={t}>
              <line x1={x(t)} x2={x(t)} y1={height - pad.bottom} y2={height - pad.bottom + 4} stroke="currentColor" />
              <text x={x(t)} y={height - pad.bottom + 16} textAnchor="middle" fontSize="11" fill="currentColor">
                {t}
              </text>
            </g>
          ))}
          <text x={width / 2} y={height - 2} textAnchor="middle" fontSize="11" fill="currentColor">
            Difference in risk, percentage points (exposed minus not exposed)
          </text>
        </svg>
      }
      table={<IntervalTable rows={[{ label, estimate, lower, upper }]} format={(v) => (v === null ? 'not defined' : points(v))} />}
    />
  );
}

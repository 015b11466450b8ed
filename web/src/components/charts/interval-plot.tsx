// The ESM build of the core component: the CommonJS one (lib/core) arrives as a module object under Vite.
import ReactEChartsCore from 'echarts-for-react/esm/core';
import type { CustomSeriesRenderItemAPI, CustomSeriesRenderItemParams, EChartsOption } from 'echarts';
import { useMemo } from 'react';
import { formatEstimate } from '../../lib/format';
import type { CsvExport } from '../table/export-button';
import { ChartFigure } from './chart-figure';
import { IntervalTable } from './interval-table';
import { echarts, tokenColour } from './echarts-setup';

/**
 * Horizontal interval plot for ratios on a log axis: one row per item, a point for the estimate,
 * a whisker for the interval, a dashed line at 1 (no difference). The point's shape and the text
 * label carry the meaning, so colour is never the only signal; a table alternative sits beside it.
 */
export interface IntervalItem {
  label: string;
  estimate: number | null;
  lower: number | null;
  upper: number | null;
  /** Marks the reference row (estimate 1 by definition). */
  reference?: boolean;
}

const finite = (x: number | null): x is number => x !== null && Number.isFinite(x) && x > 0;

export function IntervalPlot({
  title,
  items,
  valueLabel = 'Rate ratio (log scale)',
  csv,
}: {
  title: string;
  items: IntervalItem[];
  valueLabel?: string;
  csv?: CsvExport;
}) {
  const option = useMemo<EChartsOption>(() => {
    const values = items.flatMap((i) => [i.estimate, i.lower, i.upper]).filter(finite);
    const min = Math.min(1, ...values);
    const max = Math.max(1, ...values);
    // Axis ends at powers of 2 around the data and 1 (ticks at 0.25, 0.5, 1, 2, 4 ... read easily as
    // "half", "double"); infinite limits run to the edge.
    // Past 1/16 or 16 the powers of 2 would read 0.03125: powers of 10 take over (0.01, 0.1, 1, 10).
    const wide = min < 1 / 16 || max > 16;
    const base = wide ? 10 : 2;
    const lo = base ** Math.floor(Math.log(min) / Math.log(base) - 0.01);
    const hi = base ** Math.ceil(Math.log(max) / Math.log(base) + 0.01);
    const ink = tokenColour('ink', '#1f3a3d');
    const accent = tokenColour('accent', '#3a44a6');
    const labels = items.map((i) => i.label);
    return {
      aria: {
        enabled: true,
        description: `${title}. ${items.map((i) => `${i.label}: ${formatEstimate(i.estimate)} (${formatEstimate(i.lower)} to ${formatEstimate(i.upper)})`).join('; ')}.`,
      },
      animation: false,
      grid: { left: 8, right: 24, top: 16, bottom: 40, containLabel: true },
      xAxis: {
        type: 'log',
        logBase: base,
        min: lo,
        max: hi,
        name: valueLabel,
        nameLocation: 'middle',
        nameGap: 26,
        axisLabel: { formatter: (v: number) => formatEstimate(v) },
      },
      yAxis: { type: 'category', data: labels, inverse: true, axisTick: { show: false } },
      tooltip: {
        trigger: 'item',
        formatter: (p: unknown) => {
          const item = items[(p as { dataIndex: number }).dataIndex];
          return item ? `${item.label}<br/>${formatEstimate(item.estimate)} (${formatEstimate(item.lower)} to ${formatEstimate(item.upper)})` : '';
        },
      },
      series: [
        {
          type: 'custom',
          name: 'interval',
          renderItem: (_params: CustomSeriesRenderItemParams, api: CustomSeriesRenderItemAPI) => {
            const row = api.value(0) as number;
            const l = api.value(1) as number;
            const u = api.value(2) as number;
            const a = api.coord([l, row]);
            const b = api.coord([u, row]);
            const h = 6;
            const style = { stroke: ink, lineWidth: 2 };
            return {
              type: 'group',
              children: [
                { type: 'line', shape: { x1: a[0], y1: a[1], x2: b[0], y2: b[1] }, style },
                { type: 'line', shape: { x1: a[0], y1: a[1]! - h, x2: a[0], y2: a[1]! + h }, style },
                { type: 'line', shape: { x1: b[0], y1: b[1]! - h, x2: b[0], y2: b[1]! + h }, style },
              ],
            };
          },
          encode: { x: [1, 2], y: 0 },
          data: items.map((i, idx) => [idx, clamp(i.lower, lo, hi), clamp(i.upper, lo, hi)]).filter((d) => d[1] !== null && d[2] !== null),
          z: 1,
        },
        {
          type: 'scatter',
          name: 'estimate',
          data: items.map((i, idx) => (finite(i.estimate) ? { value: [i.estimate, idx], symbol: i.reference ? 'diamond' : 'rect' } : { value: [null, idx] })),
          symbolSize: 11,
          itemStyle: { color: accent, borderColor: ink, borderWidth: 1 },
          label: {
            show: true,
            position: 'top',
            formatter: (p: unknown) => formatEstimate((p as { value: [number, number] }).value[0]),
            color: ink,
            fontSize: 11,
          },
          markLine: {
            silent: true,
            symbol: 'none',
            lineStyle: { type: 'dashed', color: ink },
            label: { formatter: 'no difference', position: 'start', color: ink },
            data: [{ xAxis: 1 }],
          },
          z: 2,
        },
      ],
    } as EChartsOption;
  }, [items, title, valueLabel]);

  return (
    <ChartFigure
      title={title}
      csv={csv}
      chart={
        <div>
          <ReactEChartsCore
            echarts={echarts}
            option={option}
            notMerge
            style={{ height: Math.max(140, 48 * items.length + 70), width: '100%' }}
            opts={{ renderer: 'svg' }}
          />
        </div>
      }
      table={<IntervalTable rows={items} format={formatEstimate} />}
    />
  );
}

function clamp(x: number | null, lo: number, hi: number): number | null {
  if (x === null) return null;
  if (x === Infinity) return hi;
  if (x <= 0) return lo;
  return Math.min(hi, Math.max(lo, x));
}

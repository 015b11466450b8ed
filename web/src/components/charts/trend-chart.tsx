// The ESM build of the core component: the CommonJS one (lib/core) arrives as a module object under Vite.
import ReactEChartsCore from 'echarts-for-react/esm/core';
import type { EChartsOption, LineSeriesOption } from 'echarts';
import { useMemo } from 'react';
import { formatAmount, formatEstimate } from '../../lib/format';
import type { CsvExport } from '../table/export-button';
import { ChartFigure } from './chart-figure';
import { chartSeriesColours, echarts, tokenColour } from './echarts-setup';

/**
 * Rate per period for one or more exposure groups, each with its interval as a shaded band, and
 * optionally the u-chart centre line and limits (dashed and dotted, so they differ by more than
 * colour). Hovering a point shows cases, person-time and the interval. The table alternative
 * lists the same numbers.
 */
export interface TrendPoint {
  period: string;
  rate: number | null;
  lower: number | null;
  upper: number | null;
  /** Already suppressed for the reader's role where needed: "<5" or a number. */
  cases: string;
  personTime: number;
  /** A period not complete when the run read its data: drawn hollow, and said in the tooltip and table. */
  partial?: boolean;
}

export interface TrendSeries {
  name: string;
  points: TrendPoint[];
}

export interface UChartLimits {
  centre: number | null;
  ucl: (number | null)[];
  lcl: (number | null)[];
}

const symbols = ['circle', 'rect', 'triangle', 'diamond', 'pin', 'arrow'];
/** ECharts draws a built-in symbol hollow with the `empty` prefix. */
const hollow = (symbol: string) => `empty${symbol[0]!.toUpperCase()}${symbol.slice(1)}`;

export function TrendChart({ title, periods, series, limits, unit, csv }: { title: string; periods: string[]; series: TrendSeries[]; limits?: UChartLimits; unit: string; csv?: CsvExport }) {
  const option = useMemo<EChartsOption>(() => {
    const palette = chartSeriesColours();
    const ink = tokenColour('ink', '#17202e');
    const byPeriod = (s: TrendSeries) => periods.map((p) => s.points.find((pt) => pt.period === p) ?? null);
    const out: LineSeriesOption[] = [];
    series.forEach((s, i) => {
      const colour = palette[i % palette.length]!;
      const pts = byPeriod(s);
      const stack = `band-${i}`;
      // The band is drawn as an invisible lower line with the interval width stacked on top of it.
      out.push({ type: 'line', name: `${s.name} lower`, stack, data: pts.map((p) => p?.lower ?? null), lineStyle: { opacity: 0 }, symbol: 'none', silent: true, tooltip: { show: false } });
      out.push({
        type: 'line',
        name: `${s.name} interval`,
        stack,
        data: pts.map((p) => (p && p.lower !== null && p.upper !== null && Number.isFinite(p.upper) ? p.upper - p.lower : null)),
        lineStyle: { opacity: 0 },
        areaStyle: { color: colour, opacity: 0.15 },
        symbol: 'none',
        silent: true,
        tooltip: { show: false },
      });
      const symbol = symbols[i % symbols.length]!;
      out.push({
        type: 'line',
        name: s.name,
        data: pts.map((p) => (p?.partial ? { value: p.rate, symbol: hollow(symbol), symbolSize: 9 } : (p?.rate ?? null))),
        symbol,
        symbolSize: 7,
        lineStyle: { color: colour, width: 2 },
        itemStyle: { color: colour },
        connectNulls: false,
      });
    });
    if (limits) {
      out.push({ type: 'line', name: 'u-chart centre', data: periods.map(() => limits.centre), symbol: 'none', itemStyle: { color: ink }, lineStyle: { color: ink, type: 'solid', width: 1 } });
      out.push({ type: 'line', name: 'upper limit (3σ)', data: limits.ucl, symbol: 'none', itemStyle: { color: ink }, step: 'middle', lineStyle: { color: ink, type: 'dashed', width: 1 } });
      out.push({ type: 'line', name: 'lower limit (3σ)', data: limits.lcl, symbol: 'none', itemStyle: { color: ink }, step: 'middle', lineStyle: { color: ink, type: 'dotted', width: 1 } });
    }
    const legend = [...series.map((s) => s.name), ...(limits ? ['u-chart centre', 'upper limit (3σ)', 'lower limit (3σ)'] : [])];
    return {
      aria: { enabled: true, description: `${title}: ${series.map((s) => s.name).join(', ')} over ${periods.length} periods, ${unit}.` },
      animation: false,
      legend: { data: legend, bottom: 0 },
      grid: { left: 8, right: 16, top: 24, bottom: 56, containLabel: true },
      xAxis: { type: 'category', data: periods, boundaryGap: false },
      yAxis: { type: 'value', name: `Rate ${unit}`, nameTextStyle: { align: 'left' }, min: 0, axisLabel: { formatter: (v: number) => formatEstimate(v) } },
      tooltip: {
        trigger: 'item',
        formatter: (p: unknown) => {
          const { seriesName, dataIndex } = p as { seriesName: string; dataIndex: number };
          const s = series.find((x) => x.name === seriesName);
          const pt = s?.points.find((x) => x.period === periods[dataIndex]);
          if (!s || !pt) return seriesName;
          return `${s.name}, ${pt.period}${pt.partial ? ' (partial period)' : ''}<br/>Rate ${formatEstimate(pt.rate)} ${unit}<br/>Interval ${formatEstimate(pt.lower)} to ${formatEstimate(pt.upper)}<br/>Cases ${pt.cases} · person-time ${formatAmount(pt.personTime)}`;
        },
      },
      series: out,
    } as EChartsOption;
  }, [periods, series, limits, title, unit]);

  return (
    <ChartFigure
      title={title}
      csv={csv}
      chart={
        <ReactEChartsCore echarts={echarts} option={option} notMerge style={{ height: 340, width: '100%' }} opts={{ renderer: 'svg' }} />
      }
      table={
        <>
          <thead>
            <tr className="border-b border-ink text-left">
              {['Group', 'Period', 'Cases', 'Person-time', `Rate ${unit}`, 'Lower', 'Upper', ...(limits ? ['Upper limit (3σ)', 'Signal'] : []), 'Completeness'].map((c) => (
                <th key={c} scope="col" className="px-2 py-1">{c}</th>
              ))}
            </tr>
          </thead>
          <tbody>
            {series.flatMap((s) =>
              s.points.map((pt) => {
                const idx = periods.indexOf(pt.period);
                const ucl = limits?.ucl[idx] ?? null;
                return (
                  <tr key={`${s.name}-${pt.period}`} className="border-b border-line">
                    <th scope="row" className="px-2 py-1 text-left font-medium">{s.name}</th>
                    <td className="px-2 py-1">{pt.period}</td>
                    <td className="px-2 py-1 tabular-nums">{pt.cases}</td>
                    <td className="px-2 py-1 tabular-nums">{formatAmount(pt.personTime)}</td>
                    <td className="px-2 py-1 tabular-nums">{formatEstimate(pt.rate)}</td>
                    <td className="px-2 py-1 tabular-nums">{formatEstimate(pt.lower)}</td>
                    <td className="px-2 py-1 tabular-nums">{formatEstimate(pt.upper)}</td>
                    {limits && <td className="px-2 py-1 tabular-nums">{formatEstimate(ucl)}</td>}
                    {limits && <td className="px-2 py-1">{pt.rate !== null && ucl !== null && pt.rate > ucl ? 'above the upper limit' : 'within'}</td>}
                    <td className="px-2 py-1">{pt.partial ? 'partial' : 'complete'}</td>
                  </tr>
                );
              }),
            )}
          </tbody>
        </>
      }
    />
  );
}

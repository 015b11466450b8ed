// The ESM build of the core component: the CommonJS one (lib/core) arrives as a module object under Vite.
import ReactEChartsCore from 'echarts-for-react/esm/core';
import type { EChartsOption, SeriesOption } from 'echarts';
import { useId, useMemo, useState } from 'react';
import { formatAmount, formatEstimate } from '../../lib/format';
import type { CsvExport } from '../table/export-button';
import { ChartFigure } from './chart-figure';
import { chartSeriesColours, echarts, tokenColour } from './echarts-setup';
import { linearAxis, logAxis, type RateScale } from './rate-axis';
import { withheldPeriods, withheldWords } from './withheld-points';

/**
 * Rate per period for one or more exposure groups, each with its interval as a shaded band, and
 * optionally the u-chart centre line and limits (solid, dashed and dotted, drawn as steps: each
 * month's limit is flat across its month). A withheld point (a count too small to show the
 * reader) is a gap in the line and band with a hollow marker on the axis, named in the legend.
 * The value axis is linear (stopping at a robust maximum, points beyond it drawn at the edge as
 * arrows with their values) or logarithmic, the reader's choice. Hovering a point shows cases,
 * person-time and the interval; the table alternative lists the same numbers.
 */
export interface TrendPoint {
  period: string;
  rate: number | null;
  lower: number | null;
  upper: number | null;
  /** Already suppressed for the reader's role where needed: "withheld" or a number. */
  cases: string;
  personTime: number;
  /** A period not complete when the run read its data: drawn hollow, and said in the tooltip and table. */
  partial?: boolean;
  /** The count is withheld from this reader: a gap with a marker, never a dot. */
  withheld?: boolean;
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

export const WITHHELD_LEGEND = 'withheld: a small count, or one it would reveal';
export const ABOVE_AXIS_LEGEND = 'above the axis: value written beside';

const symbols = ['circle', 'rect', 'triangle', 'diamond', 'pin', 'arrow'];
/** ECharts draws a built-in symbol hollow with the `empty` prefix. */
const hollow = (symbol: string) => `empty${symbol[0]!.toUpperCase()}${symbol.slice(1)}`;
const finite = (x: number | null | undefined): x is number => x !== null && x !== undefined && Number.isFinite(x);

export function TrendChart({
  title,
  periods,
  series,
  limits,
  unit,
  csv,
}: {
  title: string;
  periods: string[];
  series: TrendSeries[];
  limits?: UChartLimits;
  unit: string;
  csv?: CsvExport;
}) {
  const [scale, setScale] = useState<RateScale>('linear');
  const scaleId = useId();
  const withheldAt = withheldPeriods(periods, series);
  const option = useMemo<EChartsOption>(() => {
    const palette = chartSeriesColours();
    const ink = tokenColour('ink', '#17202e');
    const muted = tokenColour('muted', '#5f6775');
    const byPeriod = (s: TrendSeries) => periods.map((p) => s.points.find((pt) => pt.period === p) ?? null);
    const shown = series.flatMap((s) => s.points.filter((p) => !p.withheld));
    const values = [
      ...shown.flatMap((p) => [p.rate, p.upper, ...(scale === 'log' ? [p.lower] : [])]),
      ...(limits ? [limits.centre, ...limits.ucl] : []),
    ].filter(finite);
    const lin = linearAxis(values);
    const logBounds = logAxis(values);
    const top = scale === 'log' ? logBounds.max : lin.max;
    const bottom = scale === 'log' ? logBounds.min : 0;
    /** A value as drawn: within the axis, and nothing at or below zero on a log axis. */
    const drawn = (v: number | null | undefined): number | null => {
      if (v === Infinity) return top;
      if (!finite(v)) return null;
      if (scale === 'log' && v <= 0) return null;
      return Math.min(top, Math.max(bottom, v));
    };
    let clipped = false;
    const out: SeriesOption[] = [];
    // One hollow marker on the axis per period with anything withheld, naming the groups in its tooltip.
    const withheldMarks = withheldPeriods(periods, series).map((w) => ({ value: [w.period, bottom] as [string, number], groups: w.groups }));
    series.forEach((s, i) => {
      const colour = palette[i % palette.length]!;
      const symbol = symbols[i % symbols.length]!;
      const pts = byPeriod(s).map((p) => (p && !p.withheld ? p : null));
      const stack = `band-${i}`;
      const lower = pts.map((p) => (p ? drawn(p.lower ?? bottom) : null));
      const upper = pts.map((p) => (p ? drawn(p.upper) : null));
      // The band is drawn as an invisible lower line with the interval width stacked on top of it.
      out.push({
        type: 'line',
        name: `${s.name} lower`,
        stack,
        data: lower,
        lineStyle: { opacity: 0 },
        symbol: 'none',
        silent: true,
        tooltip: { show: false },
        connectNulls: false,
      });
      out.push({
        type: 'line',
        name: `${s.name} interval`,
        stack,
        data: lower.map((l, j) => (l !== null && upper[j] !== null ? upper[j]! - l : null)),
        lineStyle: { opacity: 0 },
        areaStyle: { color: colour, opacity: 0.14 },
        symbol: 'none',
        silent: true,
        tooltip: { show: false },
        connectNulls: false,
      });
      out.push({
        type: 'line',
        name: s.name,
        data: pts.map((p) => {
          if (!p || !finite(p.rate)) return null;
          if (p.rate > top) {
            clipped = true;
            return {
              value: top,
              symbol: 'triangle',
              symbolSize: 12,
              label: { show: true, position: 'right', formatter: formatEstimate(p.rate), color: ink, fontSize: 11 },
            };
          }
          const v = drawn(p.rate);
          return p.partial ? { value: v, symbol: hollow(symbol), symbolSize: 9 } : v;
        }),
        symbol,
        symbolSize: 7,
        lineStyle: { color: colour, width: 2 },
        itemStyle: { color: colour },
        connectNulls: false,
      });
    });
    if (withheldMarks.length > 0) {
      out.push({
        type: 'scatter',
        name: WITHHELD_LEGEND,
        data: withheldMarks.map((m) => m.value),
        symbol: 'emptyCircle',
        symbolSize: 8,
        itemStyle: { color: muted, borderColor: muted, borderWidth: 1.5 },
        tooltip: {
          formatter: (p: unknown) => {
            const m = withheldMarks[(p as { dataIndex: number }).dataIndex];
            return m ? `${m.value[0]}: withheld for ${m.groups.join(', ')} (a small count, or one it would reveal)` : '';
          },
        },
        z: 3,
      });
    }
    if (clipped) out.push({ type: 'scatter', name: ABOVE_AXIS_LEGEND, data: [], symbol: 'triangle', itemStyle: { color: ink } });
    if (limits) {
      out.push({
        type: 'line',
        name: 'u-chart centre',
        data: periods.map(() => drawn(limits.centre)),
        symbol: 'none',
        itemStyle: { color: ink },
        lineStyle: { color: ink, type: 'solid', width: 1 },
      });
      out.push({
        type: 'line',
        name: 'upper limit (3σ)',
        data: limits.ucl.map(drawn),
        symbol: 'none',
        itemStyle: { color: ink },
        step: 'middle',
        lineStyle: { color: ink, type: 'dashed', width: 1.5 },
      });
      out.push({
        type: 'line',
        name: 'lower limit (3σ)',
        data: limits.lcl.map(drawn),
        symbol: 'none',
        itemStyle: { color: ink },
        step: 'middle',
        lineStyle: { color: ink, type: 'dotted', width: 1.5 },
      });
    }
    const legend = [
      ...series.map((s) => s.name),
      ...(withheldMarks.length > 0 ? [WITHHELD_LEGEND] : []),
      ...(clipped ? [ABOVE_AXIS_LEGEND] : []),
      ...(limits ? ['u-chart centre', 'upper limit (3σ)', 'lower limit (3σ)'] : []),
    ];
    return {
      aria: {
        enabled: true,
        description: `${title}: ${series.map((s) => s.name).join(', ')} over ${periods.length} periods, ${unit}, ${scale === 'log' ? 'logarithmic' : 'linear'} scale.${
          withheldMarks.length
            ? ` Figures withheld: ${withheldWords(
                withheldMarks.map((m) => ({ period: m.value[0], groups: m.groups })),
                periods.length,
              )}.`
            : ''
        }`,
      },
      animation: false,
      textStyle: { fontFamily: 'Noto Sans, system-ui, sans-serif', color: ink },
      legend: { data: legend, bottom: 0, textStyle: { color: ink } },
      grid: { left: 8, right: clipped ? 56 : 16, top: 28, bottom: 64, containLabel: true },
      xAxis: { type: 'category', data: periods, boundaryGap: true, axisLabel: { color: ink } },
      yAxis: {
        ...(scale === 'log' ? { type: 'log' as const, logBase: 10, min: bottom, max: top } : { type: 'value' as const, min: 0, max: top }),
        name: `Rate ${unit}${scale === 'log' ? ' (log scale)' : ''}`,
        nameTextStyle: { align: 'left', color: ink },
        axisLabel: { formatter: (v: number) => formatEstimate(v), color: ink },
        splitLine: { lineStyle: { color: tokenColour('line', '#d3d9e2') } },
      },
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
  }, [periods, series, limits, title, unit, scale]);

  return (
    <ChartFigure
      title={title}
      csv={csv}
      controls={
        <fieldset className="flex items-center gap-3 text-sm">
          <legend className="sr-only">Rate scale of {title}</legend>
          {(['linear', 'log'] as const).map((s) => (
            <label key={s} className="flex items-center gap-1">
              <input type="radio" name={`${scaleId}-scale`} value={s} checked={scale === s} onChange={() => setScale(s)} />
              {s === 'linear' ? 'Linear' : 'Log scale'}
            </label>
          ))}
        </fieldset>
      }
      chart={
        <>
          <ReactEChartsCore echarts={echarts} option={option} notMerge style={{ height: 360, width: '100%' }} opts={{ renderer: 'svg' }} />
          {withheldAt.length > 0 && (
            <p className="mt-1 text-xs text-ink-soft">
              Gaps with a hollow marker on the axis are periods whose figures are withheld from you (a count too small to show, or one that would reveal it):{' '}
              {withheldWords(withheldAt, periods.length)}.
            </p>
          )}
        </>
      }
      table={
        <>
          <thead>
            <tr className="border-b border-ink text-left">
              {[
                'Group',
                'Period',
                'Cases',
                'Person-time',
                `Rate ${unit}`,
                'Lower',
                'Upper',
                ...(limits ? ['Upper limit (3σ)', 'Signal'] : []),
                'Completeness',
              ].map((c) => (
                <th key={c} scope="col" className="px-2 py-1">
                  {c}
                </th>
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
                    <th scope="row" className="px-2 py-1 text-left font-medium">
                      {s.name}
                    </th>
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

// The ESM build of the core component: the CommonJS one (lib/core) arrives as a module object under Vite.
import ReactEChartsCore from 'echarts-for-react/esm/core';
import type { EChartsOption } from 'echarts';
import { useMemo } from 'react';
import { AUDIOGRAM_FREQUENCIES, type Ear } from '@ratewarden/shared/hearing/audiogram';
import type { StoredAudiogram } from '@ratewarden/shared/hearing/hearing-view';
import { ChartFigure } from '../../components/charts/chart-figure';
import { chartSeriesColours, echarts, tokenColour } from '../../components/charts/echarts-setup';

const testLabel = (a: StoredAudiogram) => `${a.testDate} ${a.testType}`;

/**
 * One ear's thresholds per frequency, one line per test, the hearing level axis growing downward
 * as audiograms are read (0 dB HL at the top, losses below). The baseline in use is drawn thicker
 * and dashed, and named in the legend; the table alternative lists every value.
 */
export function AudiogramChart({ ear, tests, baselineId }: { ear: Ear; tests: StoredAudiogram[]; baselineId: string | null }) {
  const title = `${ear === 'left' ? 'Left' : 'Right'} ear: hearing threshold levels (dB HL) by frequency`;
  const option = useMemo<EChartsOption>(() => {
    const palette = chartSeriesColours();
    const ink = tokenColour('ink', '#17202e');
    return {
      aria: { enabled: true, description: `${title}; ${tests.length} tests.` },
      animation: false,
      grid: { left: 52, right: 16, top: 48, bottom: 40 },
      legend: { top: 0, type: 'scroll', textStyle: { color: ink } },
      tooltip: { trigger: 'axis', valueFormatter: (v) => (v == null ? 'not tested' : `${String(v)} dB HL`) },
      xAxis: { type: 'category', name: 'Hz', nameLocation: 'middle', nameGap: 26, data: AUDIOGRAM_FREQUENCIES.map(String), axisLabel: { color: ink } },
      yAxis: { type: 'value', inverse: true, min: -10, max: 120, interval: 10, name: 'dB HL', axisLabel: { color: ink } },
      series: tests.map((t, i) => {
        const baseline = t.id === baselineId;
        return {
          type: 'line' as const,
          name: baseline ? `${testLabel(t)} (baseline in use)` : testLabel(t),
          data: AUDIOGRAM_FREQUENCIES.map((f) => t.thresholds[f] ?? null),
          connectNulls: false,
          symbol: ear === 'left' ? 'rect' : 'circle',
          symbolSize: 7,
          lineStyle: { width: baseline ? 3.5 : 1.8, type: baseline ? ('dashed' as const) : ('solid' as const), color: palette[i % palette.length] },
          itemStyle: { color: palette[i % palette.length] },
        };
      }),
    };
  }, [ear, tests, baselineId, title]);
  return (
    <ChartFigure
      title={title}
      chart={<ReactEChartsCore echarts={echarts} option={option} notMerge style={{ height: 320 }} opts={{ renderer: 'svg' }} />}
      table={
        <>
          <thead>
            <tr>
              <th scope="col" className="text-left">
                Test
              </th>
              {AUDIOGRAM_FREQUENCIES.map((f) => (
                <th key={f} scope="col" className="text-right">
                  {f} Hz
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {tests.map((t) => (
              <tr key={t.id}>
                <th scope="row" className="text-left font-normal">
                  {testLabel(t)}
                  {t.id === baselineId ? ' (baseline in use)' : ''}
                </th>
                {AUDIOGRAM_FREQUENCIES.map((f) => (
                  <td key={f} className="text-right tabular-nums">
                    {t.thresholds[f] ?? '—'}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </>
      }
    />
  );
}

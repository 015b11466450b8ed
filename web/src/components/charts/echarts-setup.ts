import { CustomChart, LineChart, ScatterChart } from 'echarts/charts';
import { GridComponent, LegendComponent, MarkLineComponent, TooltipComponent, AriaComponent } from 'echarts/components';
import * as echarts from 'echarts/core';
import { SVGRenderer } from 'echarts/renderers';

/**
 * ECharts with only the parts Ratewarden draws: line, scatter and custom (interval whiskers)
 * series, grid, tooltip, legend, mark lines and the aria description, rendered as SVG (crisp in
 * print). The full `echarts` import would add about 1.5 MB to the bundle.
 */
echarts.use([LineChart, ScatterChart, CustomChart, GridComponent, TooltipComponent, LegendComponent, MarkLineComponent, AriaComponent, SVGRenderer]);

export { echarts };

/** Colours come from the design tokens in styles/index.css; charts read them once. */
export function tokenColour(name: string, fallback: string): string {
  if (typeof document === 'undefined') return fallback;
  const v = getComputedStyle(document.documentElement).getPropertyValue(`--color-${name}`).trim();
  return v || fallback;
}

/** The series colours of the chart theme, in the order groups take them (styles/index.css). */
export function chartSeriesColours(): string[] {
  return [tokenColour('series-1', '#3a44a6'), tokenColour('series-2', '#0b6e78'), tokenColour('series-3', '#8b3a8f'), tokenColour('series-4', '#8a5300')];
}

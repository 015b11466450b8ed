import { DECADE_AGE_BAND_EDGES, type RunSettings } from './runs';

/**
 * Age bands from their edges. A band is stored by its lower bound: 0 for the band under the first
 * edge, else the edge it starts at (so ten-year bands store 0, 10, 20, … as runs always did). The
 * run's SQL computes the same with `width_bucket` (worker/src/runs/cells-query.ts).
 */
export function ageBandEdgesOf(settings: Pick<RunSettings, 'ageBandEdges'>): readonly number[] {
  return settings.ageBandEdges ?? DECADE_AGE_BAND_EDGES;
}

/** The band (its lower bound) an age falls in. */
export function ageBandOf(age: number, edges: readonly number[]): number {
  let band = 0;
  for (const e of edges) if (age >= e) band = e;
  return band;
}

/**
 * A band's name: "under 18", "18–24", "65 and over".
 * @example ageBandLabel(25, [18, 25, 65]) // '25–64'
 */
export function ageBandLabel(lower: number, edges: readonly number[]): string {
  if (lower < edges[0]!) return `under ${edges[0]}`;
  const i = edges.indexOf(lower);
  if (i < 0) return `${lower} and over`; // a band of other edges (an earlier version's)
  return i === edges.length - 1 ? `${lower} and over` : `${lower}–${edges[i + 1]! - 1}`;
}

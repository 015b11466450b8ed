import type { DataSource } from 'typeorm';
import type { Principal } from '@ratewarden/shared/permissions';
import type { Flag, FlagDetail } from '@ratewarden/shared/flags';
import { isSmallCount } from '@ratewarden/shared/small-cells';
import { showsSmallCells as opens } from '../runs/runs-service';
import { cellKey, siteMarginWithheld } from '../runs/site-margins';

/** Who reads a flag: every role but the physician gets small counts withheld. */
export interface FlagReader {
  principal: Principal;
  smallCellThreshold: number;
}

/** Event detail keys that carry the measure's value (with the person-time they give the count back). */
const VALUE_KEYS = new Set(['value', 'previous', 'previousWorst']);

/**
 * A flag as its reader may see it: when its count of cases is small, the count and every figure
 * computed from it (the measure's value, worst value, estimate and limits, expected count, p and q,
 * and the values in its history) are withheld, as in the run results; the rule, the group, the
 * period, the person-time and the decisions stay.
 */
export function flagAsSeenBy<T extends Flag | FlagDetail>(flag: T, reader: FlagReader, withheldByMargin = false): T {
  const small = isSmallCount(flag.figures.cases ?? 0, reader.smallCellThreshold);
  if (opens(reader.principal) || (!withheldByMargin && !small)) return { ...flag, figures: { ...flag.figures, suppressed: false, withheld: null } };
  const figures = { ...flag.figures, suppressed: true, withheld: small ? ('small' as const) : ('complement' as const), cases: null, value: null, estimate: null, lower: null, upper: null, expected: null, p: null, q: null };
  const out = { ...flag, value: null, worstValue: null, figures };
  if ('events' in flag) {
    (out as FlagDetail).events = flag.events.map((e) => ({
      ...e,
      detail: e.detail && typeof e.detail === 'object' ? Object.fromEntries(Object.entries(e.detail as Record<string, unknown>).filter(([k]) => !VALUE_KEYS.has(k))) : e.detail,
    }));
  }
  return out as T;
}

/**
 * flagAsSeenBy for a list, with the site margin too: a flag's count is the company's figure of
 * its latest run, which the results withhold as a complement when every site's part of it is
 * small (site-margins.ts); the flag then withholds it as well. One margin read per run × outcome ×
 * window × period among the flags.
 */
export async function flagsAsSeenBy<T extends Flag | FlagDetail>(ds: DataSource, flags: T[], reader: FlagReader): Promise<T[]> {
  if (opens(reader.principal)) return flags.map((f) => flagAsSeenBy(f, reader));
  const margins = new Map<string, Promise<Set<string>>>();
  const marginOf = (f: T) => {
    const k = [f.figures.runId, f.outcomeId, f.figures.window, f.figures.period].join('|');
    let m = margins.get(k);
    if (!m) {
      const q = { outcomeId: f.outcomeId, window: f.figures.window, from: f.figures.period, to: f.figures.period };
      m = siteMarginWithheld(ds, f.figures.runId, q, reader.smallCellThreshold).then((w) => new Set(w.keys()));
      margins.set(k, m);
    }
    return m;
  };
  return Promise.all(flags.map(async (f) => flagAsSeenBy(f, reader, (await marginOf(f)).has(cellKey(null, f.outcomeId, f.exposureGroupId, f.figures.window, f.figures.period)))));
}

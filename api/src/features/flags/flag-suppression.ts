import type { Principal } from '@ratewarden/shared/permissions';
import type { Flag, FlagDetail } from '@ratewarden/shared/flags';
import { isSmallCount } from '@ratewarden/shared/small-cells';

/** Who reads a flag: every role but the physician gets small counts withheld. */
export interface FlagReader {
  principal: Principal;
  smallCellThreshold: number;
}

const opens = (p: Principal) => p.kind === 'user' && p.role === 'physician';

/** Event detail keys that carry the measure's value (with the person-time they give the count back). */
const VALUE_KEYS = new Set(['value', 'previous', 'previousWorst']);

/**
 * A flag as its reader may see it: when its count of cases is small, the count and every figure
 * computed from it (the measure's value, worst value, estimate and limits, expected count, p and q,
 * and the values in its history) are withheld, as in the run results; the rule, the group, the
 * period, the person-time and the decisions stay.
 */
export function flagAsSeenBy<T extends Flag | FlagDetail>(flag: T, reader: FlagReader): T {
  if (opens(reader.principal) || !isSmallCount(flag.figures.cases ?? 0, reader.smallCellThreshold)) return { ...flag, figures: { ...flag.figures, suppressed: false } };
  const figures = { ...flag.figures, suppressed: true, cases: null, value: null, estimate: null, lower: null, upper: null, expected: null, p: null, q: null };
  const out = { ...flag, value: null, worstValue: null, figures };
  if ('events' in flag) {
    (out as FlagDetail).events = flag.events.map((e) => ({
      ...e,
      detail: e.detail && typeof e.detail === 'object' ? Object.fromEntries(Object.entries(e.detail as Record<string, unknown>).filter(([k]) => !VALUE_KEYS.has(k))) : e.detail,
    }));
  }
  return out as T;
}

import type { Role } from '@ratewarden/shared/domain';
import type { RunResult } from '@ratewarden/shared/runs';
import { toNumber } from '../../lib/json-number';
import { showCount, type ShownCount } from '../../lib/small-cells';

/**
 * One result cell as a role may see it. When the count of cases is suppressed, so is every figure
 * computed from it (rate, limits, ratios, differences): with the person-time shown beside it, a
 * rate would give the hidden count straight back.
 */
export interface ShownResult {
  cases: ShownCount;
  hidden: boolean;
  personTime: number;
  rate: number | null;
  rateLower: number | null;
  rateUpper: number | null;
  irr: number | null;
  irrLower: number | null;
  irrUpper: number | null;
  irrP: number | null;
  ird: number | null;
  irdLower: number | null;
  irdUpper: number | null;
  irdP: number | null;
}

export function shownResult(r: RunResult, role: Role | null | undefined): ShownResult {
  const cases = showCount(r.cases, role, undefined, r.withheld ?? r.suppressed);
  const h = cases.suppressed;
  const v = (x: number | string | null) => (h ? null : toNumber(x));
  return {
    cases,
    hidden: h,
    personTime: r.personTime,
    rate: v(r.rate.estimate),
    rateLower: v(r.rate.lower),
    rateUpper: v(r.rate.upper),
    irr: v(r.irr.estimate),
    irrLower: v(r.irr.lower),
    irrUpper: v(r.irr.upper),
    irrP: h ? null : r.irr.p,
    ird: v(r.ird.estimate),
    irdLower: v(r.ird.lower),
    irdUpper: v(r.ird.upper),
    irdP: h ? null : r.ird.p,
  };
}

/** "2.345 (1.234 to 4.567)", or the reason a figure is not shown. */
export function suppressedText(threshold: string): string {
  return `not shown (${threshold} cases)`;
}

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
  /** The group's own count is withheld, and with it everything computed from it. */
  hidden: boolean;
  /**
   * The comparisons with the reference group are withheld: the group's count, or the reference
   * group's, is (with the group's rate an IRR would give the reference count back).
   */
  comparisonHidden: boolean;
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
  const ch = h || r.comparisonSuppressed;
  const v = (x: number | string | null) => (h ? null : toNumber(x));
  const c = (x: number | string | null) => (ch ? null : toNumber(x));
  return {
    cases,
    hidden: h,
    comparisonHidden: ch,
    personTime: r.personTime,
    rate: v(r.rate.estimate),
    rateLower: v(r.rate.lower),
    rateUpper: v(r.rate.upper),
    irr: c(r.irr.estimate),
    irrLower: c(r.irr.lower),
    irrUpper: c(r.irr.upper),
    irrP: ch ? null : r.irr.p,
    ird: c(r.ird.estimate),
    irdLower: c(r.ird.lower),
    irdUpper: c(r.ird.upper),
    irdP: ch ? null : r.ird.p,
  };
}

import type { Cell } from './cells-query';
import { monthIndex } from '@ratewarden/shared/months';

/** Cases and hours (in hundredths) of one group in one window, in total and by stratum. */
export interface Tally {
  cases: number;
  cents: number;
  byAge: Map<string, { cases: number; cents: number }>;
  bySite: Map<string, { cases: number; cents: number }>;
  bySex: Map<string, { cases: number; cents: number }>;
  /** Months of the window in which the group has hours. */
  months: number;
}

export function emptyTally(): Tally {
  return { cases: 0, cents: 0, byAge: new Map(), bySite: new Map(), bySex: new Map(), months: 0 };
}

function addTo(map: Map<string, { cases: number; cents: number }>, key: string, cases: number, cents: number): void {
  const t = map.get(key);
  if (t) {
    t.cases += cases;
    t.cents += cents;
  } else map.set(key, { cases, cents });
}

/** Adds `from` into `into` (used to build rolling windows from months). */
export function addTally(into: Tally, from: Tally): void {
  into.cases += from.cases;
  into.cents += from.cents;
  into.months += from.months;
  for (const [k, v] of from.byAge) addTo(into.byAge, k, v.cases, v.cents);
  for (const [k, v] of from.bySite) addTo(into.bySite, k, v.cases, v.cents);
  for (const [k, v] of from.bySex) addTo(into.bySex, k, v.cases, v.cents);
}

/** One outcome's monthly tallies per exposure group over its continuous range of months. */
export interface OutcomeSeries {
  outcomeId: number;
  firstMonth: number;
  lastMonth: number;
  /** groupId → month index → tally. */
  groups: Map<number, Map<number, Tally>>;
}

/** Folds the cells into per-outcome, per-group monthly tallies with age-band, site and sex strata (an unknown sex or birth year is a stratum of its own). */
export function buildSeries(cells: Cell[]): Map<number, OutcomeSeries> {
  const byOutcome = new Map<number, OutcomeSeries>();
  for (const c of cells) {
    const m = monthIndex(c.month);
    let s = byOutcome.get(c.outcomeId);
    if (!s) {
      s = { outcomeId: c.outcomeId, firstMonth: m, lastMonth: m, groups: new Map() };
      byOutcome.set(c.outcomeId, s);
    }
    s.firstMonth = Math.min(s.firstMonth, m);
    s.lastMonth = Math.max(s.lastMonth, m);
    let months = s.groups.get(c.groupId);
    if (!months) {
      months = new Map();
      s.groups.set(c.groupId, months);
    }
    let t = months.get(m);
    if (!t) {
      t = emptyTally();
      months.set(m, t);
    }
    t.cases += c.cases;
    t.cents += c.cents;
    addTo(t.byAge, c.ageBand === null ? 'unknown' : String(c.ageBand), c.cases, c.cents);
    addTo(t.bySite, String(c.siteId), c.cases, c.cents);
    addTo(t.bySex, c.sex ?? 'unknown', c.cases, c.cents);
  }
  for (const s of byOutcome.values()) {
    for (const months of s.groups.values()) for (const t of months.values()) t.months = t.cents > 0 ? 1 : 0;
  }
  return byOutcome;
}

/** The tally of one group over months [start, end]. */
export function windowTally(months: Map<number, Tally> | undefined, start: number, end: number): Tally {
  const sum = emptyTally();
  if (!months) return sum;
  for (let m = start; m <= end; m++) {
    const t = months.get(m);
    if (t) addTally(sum, t);
  }
  return sum;
}

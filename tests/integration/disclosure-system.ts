import type { RunResult, RunStrata } from '@ratewarden/shared/runs';
import { LinearSystem, sumOf, termsKey, type Terms } from './disclosure-linear';
import { resultKey, type By } from './disclosure-reads';
import { isWindowEnd, windowKinds, windowMonths } from '@ratewarden/shared/windows';

/**
 * What a reader can write down from what they read: one observation per published or withheld
 * count, as a linear form over the unknown true counts (site × month, the company's month, age
 * band × month, sex × month of each outcome × group), with what the reader sees of it.
 */
export type Label = { shown: number } | { withheld: string } | { absent: true };

export interface Observation {
  terms: Terms;
  label: Label;
  /** The true count (the physician's figure). */
  truth: number;
  /**
   * A count of a stratum table by age band or sex, whose withheld label is the table's (its
   * group's count, or 'strata'): it bounds the table's total, which the results hold, not the stratum.
   */
  tableLabel?: boolean;
  what: string;
}

export interface Universe {
  outcomes: number[];
  groups: number[];
  sites: number[];
  months: string[];
  threshold: number;
  /** The whole-period start of the run's settings (shared/src/windows.ts), null: none. */
  wholeStart: string | null;
}

/** The months of the cohort a window ending at `period` covers (shared/src/windows.ts; months before the cohort hold nothing). */
export const monthsOf = (u: Universe, window: string, period: string): number[] => {
  if (!u.months.includes(period)) throw new Error(`period ${period} outside the cohort`);
  const months = windowMonths(window as (typeof windowKinds)[number], period, { wholeStart: u.wholeStart });
  if (months.length === 0) throw new Error(`${period} ends no ${window} window`);
  return months.map((m) => u.months.indexOf(m)).filter((m) => m >= 0);
};

const x = (o: number, g: number, s: number, m: number) => `x|${o}|${g}|${s}|${m}`;
const t = (o: number, g: number, m: number) => `t|${o}|${g}|${m}`;
const stratumVar = (by: 'age' | 'sex', o: number, g: number, key: string | null, m: number) => `${by === 'age' ? 'a' : 'z'}|${o}|${g}|${key ?? ''}|${m}`;

/** The linear form of a count of `scope` (a site, or null for the company) over a window. */
export const countTerms = (u: Universe, scope: number | null, o: number, g: number, window: string, period: string): Terms =>
  sumOf(monthsOf(u, window, period).map((m) => (scope === null ? t(o, g, m) : x(o, g, scope, m))));

/**
 * Every observation from a reader's result rows and company stratum tables (by age band, sex and
 * site), with the truth from the physician's copies of the same tables; a result row that does
 * not exist (no hours, no cases) is an observed zero.
 */
export function observe(
  u: Universe,
  seen: { results: Map<string, RunResult>; strata: Map<string, RunStrata> },
  truth: { results: Map<string, RunResult>; strata: Map<string, RunStrata> },
): Observation[] {
  const out: Observation[] = [];
  const labelOf = (cases: number | null, withheld: string | null): Label => (cases !== null ? { shown: cases } : { withheld: withheld ?? 'unlabelled' });
  for (const o of u.outcomes) {
    for (const g of u.groups) {
      for (const scope of [null, ...u.sites]) {
        for (const window of windowKinds) {
          for (const period of u.months) {
            // Rows exist only where a window of the kind ends (a quarter in March, June, ...).
            if (!isWindowEnd(window, period, { wholeStart: u.wholeStart })) continue;
            const key = resultKey(scope, o, g, window, period);
            const mine = seen.results.get(key);
            const real = truth.results.get(key);
            const terms = countTerms(u, scope, o, g, window, period);
            if (!real) out.push({ terms, label: { absent: true }, truth: 0, what: `no result ${key}` });
            else out.push({ terms, label: labelOf(mine!.cases, mine!.withheld), truth: real.cases!, what: `result ${key}` });
          }
        }
      }
    }
  }
  for (const [key, table] of seen.strata) {
    const [by, scope, o, , window, period] = key.split('|') as [By, string, string, string, string, string];
    if (scope !== 'all' || !u.outcomes.includes(Number(o))) continue;
    const real = truth.strata.get(key)!;
    const months = monthsOf(u, window, period);
    const arms: Array<['exposed' | 'reference', number | null]> = [
      ['exposed', table.exposureGroupId],
      ['reference', table.referenceGroupId],
    ];
    for (const stratum of table.strata) {
      const realStratum = real.strata.find((s) => s.key === stratum.key)!;
      for (const [arm, g] of arms) {
        const shown = stratum[arm];
        if (g === null || shown === null) continue;
        const terms =
          by === 'site'
            ? sumOf(months.map((m) => x(Number(o), g, Number(stratum.key), m)))
            : sumOf(months.map((m) => stratumVar(by, Number(o), g, stratum.key, m)));
        out.push({
          terms,
          label: labelOf(shown.cases, shown.withheld),
          truth: realStratum[arm]!.cases!,
          what: `strata ${key} ${arm} ${stratum.key ?? 'unknown'}`,
          tableLabel: by !== 'site',
        });
      }
    }
  }
  return out;
}

/** Strata keys (age bands, sexes) a reader saw for each outcome × group. */
function strataKeys(u: Universe, strata: Map<string, RunStrata>): Map<string, Set<string | null>> {
  const keys = new Map<string, Set<string | null>>();
  for (const [key, table] of strata) {
    const [by, scope, o] = key.split('|');
    if (scope !== 'all' || by === 'site') continue;
    for (const g of [table.exposureGroupId, table.referenceGroupId]) {
      if (g === null) continue;
      const k = `${by}|${o}|${g}`;
      const set = keys.get(k) ?? keys.set(k, new Set()).get(k)!;
      for (const s of table.strata) set.add(s.key);
    }
  }
  return keys;
}

/**
 * The reader's system: how the unknowns add up (the sites and, separately, the age bands and the
 * sexes make the company's month), and every observation as bounds. `labelsOnly`: a shown count
 * enters only as what its label says (0, or at least the threshold), not as its value.
 */
export function systemOf(u: Universe, observations: Observation[], strata: Map<string, RunStrata>, labelsOnly = false): LinearSystem {
  const sys = new LinearSystem();
  const keys = strataKeys(u, strata);
  for (const o of u.outcomes) {
    for (const g of u.groups) {
      for (let m = 0; m < u.months.length; m++) {
        const total = sumOf([t(o, g, m)], -1);
        sys.add(new Map([...total, ...sumOf(u.sites.map((s) => x(o, g, s, m)))]), 0, 0);
        for (const by of ['age', 'sex'] as const) {
          const ks = keys.get(`${by}|${o}|${g}`);
          if (ks) sys.add(new Map([...total, ...sumOf([...ks].map((k) => stratumVar(by, o, g, k, m)))]), 0, 0);
        }
      }
    }
  }
  const T = u.threshold;
  for (const ob of observations) {
    const l = ob.label;
    if ('absent' in l) sys.add(ob.terms, 0, 0);
    else if ('shown' in l) {
      if (!labelsOnly) sys.add(ob.terms, l.shown, l.shown);
      else if (l.shown === 0) sys.add(ob.terms, 0, 0);
      else sys.add(ob.terms, T, Infinity);
    } else if (ob.tableLabel) continue;
    else if (l.withheld === 'small') sys.add(ob.terms, 1, T - 1);
    else if (l.withheld === 'complement') sys.add(ob.terms, T, Infinity);
  }
  return sys;
}

/**
 * The true value of every unknown, from the physician's month rows (sites, company) and
 * month-window stratum tables by age band and sex.
 */
export function truthOf(u: Universe, truth: { results: Map<string, RunResult>; strata: Map<string, RunStrata> }): Map<string, number> {
  const value = new Map<string, number>();
  for (const r of truth.results.values()) {
    if (r.window !== 'month') continue;
    const m = u.months.indexOf(r.period);
    value.set(r.siteId === null ? t(r.outcomeId, r.exposureGroupId, m) : x(r.outcomeId, r.exposureGroupId, r.siteId, m), r.cases!);
  }
  for (const [key, table] of truth.strata) {
    const [by, scope, o, , window, period] = key.split('|');
    if (scope !== 'all' || window !== 'month' || by === 'site') continue;
    const m = u.months.indexOf(period!);
    for (const s of table.strata) {
      value.set(stratumVar(by as 'age' | 'sex', Number(o), table.exposureGroupId, s.key, m), s.exposed.cases!);
      if (s.reference && table.referenceGroupId !== null)
        value.set(stratumVar(by as 'age' | 'sex', Number(o), table.referenceGroupId, s.key, m), s.reference.cases!);
    }
  }
  return value;
}

export interface AttackReport {
  cellsChecked: number;
  withheld: number;
  targets: number;
  solves: number;
  /** Withheld small counts the system narrows beyond what their labels allow. */
  narrowed: string[];
  /** Bounds of the reader's system the true counts break (none: the system is the truth's). */
  untrue: string[];
}

/**
 * For every distinct withheld count whose true value is small, the least and greatest value the
 * reader's system allows must reach 1 and threshold − 1, unless the labels alone already narrow it
 * (the same system with shown values replaced by their labels) and the values narrow it no further.
 */
export function linearAttack(u: Universe, observations: Observation[], strata: Map<string, RunStrata>, truth: Map<string, number>): AttackReport {
  const full = systemOf(u, observations, strata);
  const untrue = full.violations(truth);
  if (untrue.length > 0) return { cellsChecked: observations.length, withheld: 0, targets: 0, solves: 0, narrowed: [], untrue };
  let labels: LinearSystem | null = null;
  const T = u.threshold;
  const narrowed: string[] = [];
  const seen = new Set<string>();
  let withheld = 0;
  for (const ob of observations) {
    if (!('withheld' in ob.label)) continue;
    withheld++;
    if (ob.truth < 1 || ob.truth > T - 1) continue;
    const k = termsKey(ob.terms);
    if (seen.has(k)) continue;
    seen.add(k);
    const r = full.range(ob.terms, T - 1);
    if (r.min <= 1 && r.max >= T - 1) continue;
    // The labels' range from the linear relaxation: never narrower than the integer one, so a count
    // is let through only if its labels alone narrow it at least as much.
    labels ??= systemOf(u, observations, strata, true);
    const l = labels.range(ob.terms, T - 1, { integer: false });
    if (r.min > Math.max(1, l.min) || r.max < Math.min(T - 1, l.max))
      narrowed.push(`${ob.what} (${ob.label.withheld}, true ${ob.truth}): the figures allow ${r.min}…${r.max}, its label ${l.min}…${l.max}`);
    // A leak shows in the first few; the rest would only take time.
    if (narrowed.length >= 10) break;
  }
  return { cellsChecked: observations.length, withheld, targets: seen.size, solves: full.solves + (labels?.solves ?? 0), narrowed, untrue };
}

/**
 * The withheld small counts the reader's equalities alone pin to one value (no solver needed):
 * what a product that published too much would give away.
 */
export function pinnedSmallCounts(u: Universe, observations: Observation[], strata: Map<string, RunStrata>): Map<string, number> {
  const sys = systemOf(u, observations, strata);
  const out = new Map<string, number>();
  for (const ob of observations) {
    if (!('withheld' in ob.label) || ob.truth < 1 || ob.truth > u.threshold - 1) continue;
    const v = sys.pinnedValue(ob.terms);
    if (v !== null) out.set(ob.what, v);
  }
  return out;
}

/**
 * The rolling-window difference: month(m) = R12(m) − R12(m − 1) + month(m − 12), with windows
 * and months before the first month zero, tried on every month `target` withholds with the
 * figures of `source`. Returns the months it gives a value for, with that value.
 */
export function differencing(u: Universe, target: Map<string, RunResult>, source: Map<string, RunResult>): Map<string, number> {
  const recovered = new Map<string, number>();
  const known = (scope: number | null, o: number, g: number, window: string, m: number): number | null => {
    if (m < 0) return 0;
    const r = source.get(resultKey(scope, o, g, window, u.months[m]!));
    return r === undefined ? 0 : r.cases;
  };
  for (const o of u.outcomes) {
    for (const g of u.groups) {
      for (const scope of [null, ...u.sites]) {
        for (let m = 0; m < u.months.length; m++) {
          const key = resultKey(scope, o, g, 'month', u.months[m]!);
          if (target.get(key)?.cases !== null) continue;
          const [a, b, c] = [known(scope, o, g, 'rolling12', m), known(scope, o, g, 'rolling12', m - 1), known(scope, o, g, 'month', m - 12)];
          if (a !== null && b !== null && c !== null) recovered.set(key, a - b + c);
        }
      }
    }
  }
  return recovered;
}

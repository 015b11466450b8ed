import solver from 'javascript-lp-solver';

/**
 * The linear attack on published counts: the unknowns are non-negative whole numbers of cases,
 * every published count is an equality over them, every withheld count a pair of bounds by its
 * label, and javascript-lp-solver (branch and bound over integers) finds the least and greatest
 * value a withheld count can take.
 */

/** A linear form over named unknowns (coefficients). */
export type Terms = Map<string, number>;

export const sumOf = (vars: string[], coef = 1): Terms => {
  const t: Terms = new Map();
  for (const v of vars) t.set(v, (t.get(v) ?? 0) + coef);
  return t;
};

/** A canonical text of a linear form, to recognise one count read from two tables. */
export const termsKey = (t: Terms) =>
  [...t.entries()]
    .filter(([, k]) => k !== 0)
    .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0))
    .map(([v, k]) => `${k}*${v}`)
    .join('+');

interface Row {
  terms: Terms;
  lo: number;
  hi: number;
}

const EPS = 1e-6;

/** A system of bounds on linear forms of non-negative integer unknowns. */
export class LinearSystem {
  private readonly rows: Row[] = [];
  private fixed = new Map<string, number>();
  private reduced: Row[] = [];
  private parent = new Map<string, string>();
  private rowsOf = new Map<string, Row[]>();
  private varsOf = new Map<string, string[]>();
  private prepared = false;
  /** Linear programs solved so far. */
  solves = 0;

  /** lo ≤ terms ≤ hi. */
  add(terms: Terms, lo: number, hi: number): void {
    this.rows.push({ terms, lo, hi });
    this.prepared = false;
  }

  private find(v: string): string {
    let r = v;
    while (this.parent.get(r) !== r) r = this.parent.get(r)!;
    this.parent.set(v, r);
    return r;
  }

  /**
   * Fixes every unknown an equality pins down (one free unknown left, or a sum of non-negative
   * unknowns at most 0), drops bounds the non-negativity already implies, and splits the rest into
   * independent blocks (unknowns linked through some bound).
   */
  private prepare(): void {
    if (this.prepared) return;
    const fixed = new Map<string, number>();
    for (let changed = true; changed;) {
      changed = false;
      for (const row of this.rows) {
        let c = 0;
        const free: Array<[string, number]> = [];
        for (const [v, k] of row.terms) {
          if (fixed.has(v)) c += k * fixed.get(v)!;
          else if (k !== 0) free.push([v, k]);
        }
        if (free.length === 0) continue;
        if (row.lo === row.hi && free.length === 1) {
          fixed.set(free[0]![0], (row.lo - c) / free[0]![1]);
          changed = true;
        } else if (free.every(([, k]) => k > 0) && row.hi - c <= EPS) {
          for (const [v] of free) fixed.set(v, 0);
          changed = true;
        }
      }
    }
    const reduced: Row[] = [];
    for (const row of this.rows) {
      let c = 0;
      const terms: Terms = new Map();
      for (const [v, k] of row.terms) {
        if (fixed.has(v)) c += k * fixed.get(v)!;
        else if (k !== 0) terms.set(v, k);
      }
      if (terms.size === 0) {
        if (c < row.lo - EPS || c > row.hi + EPS)
          throw new Error(`the published figures contradict each other (${termsKey(row.terms)} = ${c}, not in [${row.lo}, ${row.hi}])`);
        continue;
      }
      if ([...terms.values()].every((k) => k > 0) && row.lo - c <= EPS && row.hi === Infinity) continue;
      reduced.push({ terms, lo: row.lo - c, hi: row.hi - c });
    }
    for (const [v, x] of fixed) if (x < -EPS || Math.abs(x - Math.round(x)) > EPS) throw new Error(`unknown ${v} pinned to ${x}`);
    this.parent = new Map();
    for (const row of reduced) {
      for (const v of row.terms.keys()) if (!this.parent.has(v)) this.parent.set(v, v);
      const [first, ...rest] = [...row.terms.keys()].map((v) => this.find(v));
      for (const r of rest) if (r !== first) this.parent.set(r, first!);
    }
    this.rowsOf = new Map();
    this.varsOf = new Map();
    for (const row of reduced) {
      const root = this.find(row.terms.keys().next().value!);
      (this.rowsOf.get(root) ?? this.rowsOf.set(root, []).get(root)!).push(row);
    }
    for (const v of this.parent.keys()) {
      const root = this.find(v);
      (this.varsOf.get(root) ?? this.varsOf.set(root, []).get(root)!).push(v);
    }
    this.fixed = fixed;
    this.reduced = reduced;
    this.prepared = true;
  }

  /** The bounds an assignment of the unknowns breaks (an unknown left out is 0). */
  violations(value: Map<string, number>): string[] {
    const out: string[] = [];
    for (const row of this.rows) {
      let sum = 0;
      for (const [v, k] of row.terms) sum += k * (value.get(v) ?? 0);
      if (sum < row.lo - EPS || sum > row.hi + EPS) out.push(`${termsKey(row.terms)} = ${sum}, not in [${row.lo}, ${row.hi}]`);
    }
    return out;
  }

  /** The value of `target` when the system's equalities pin every unknown in it, else null. */
  pinnedValue(target: Terms): number | null {
    this.prepare();
    let c = 0;
    for (const [v, k] of target) {
      if (!this.fixed.has(v)) return null;
      c += k * this.fixed.get(v)!;
    }
    return c;
  }

  /**
   * The least value of `target` the system allows, and the greatest up to `cap` (a count above
   * the cap tells the reader nothing more about a small one). `integer: false` solves the linear
   * relaxation instead (quicker; its range holds the integer one: min rounded down, max up).
   */
  range(target: Terms, cap: number, { integer = true }: { integer?: boolean } = {}): { min: number; max: number } {
    this.prepare();
    let c = 0;
    const free: Terms = new Map();
    for (const [v, k] of target) {
      if (this.fixed.has(v)) c += k * this.fixed.get(v)!;
      else if (k !== 0) free.set(v, k);
    }
    if (free.size === 0) return { min: c, max: c };
    const roots = new Set([...free.keys()].map((v) => (this.parent.has(v) ? this.find(v) : v)));
    const names = new Map<string, string>();
    const variables: Record<string, Record<string, number>> = {};
    const constraints: Record<string, { min?: number; max?: number; equal?: number }> = {};
    const name = (v: string) => {
      let n = names.get(v);
      if (!n) {
        names.set(v, (n = `v${names.size}`));
        variables[n] = {};
      }
      return n;
    };
    let i = 0;
    for (const root of roots) {
      for (const v of this.varsOf.get(root) ?? [root]) name(v);
      for (const row of this.rowsOf.get(root) ?? []) {
        const r = `r${i++}`;
        constraints[r] = row.lo === row.hi ? { equal: row.lo } : { ...(row.lo > -Infinity && { min: row.lo }), ...(row.hi < Infinity && { max: row.hi }) };
        for (const [v, k] of row.terms) variables[name(v)]![r] = k;
      }
    }
    for (const [v, k] of free) {
      const n = name(v);
      variables[n]!.obj = k;
      variables[n]!.cap = k;
    }
    const ints: Record<string, 1> = Object.fromEntries([...names.values()].map((n) => [n, 1 as const]));
    const solve = (opType: 'min' | 'max', extra: Record<string, { max: number }>) => {
      this.solves++;
      const out = solver.Solve({ optimize: 'obj', opType, constraints: { ...constraints, ...extra }, variables, ...(integer && { ints }) }) as {
        feasible: boolean;
        result: number;
        bounded?: boolean;
      };
      if (!out.feasible) throw new Error(`the attacker's system has no solution for ${termsKey(target)}`);
      return out.result;
    };
    const min = solve('min', {});
    const max = solve('max', { cap: { max: cap - c } });
    return integer ? { min: Math.round(c + min), max: Math.round(c + max) } : { min: Math.floor(c + min + EPS), max: Math.ceil(c + max - EPS) };
  }
}

/**
 * Cases and hours of one series (a group's months in one scope or stratum) as prefix sums, so
 * that any window's total is two look-ups.
 */
export class MonthSeries {
  private readonly casesAt: Float64Array;
  private readonly centsAt: Float64Array;
  private sums: { cases: Float64Array; cents: Float64Array } | null = null;

  constructor(
    private readonly first: number,
    last: number,
  ) {
    this.casesAt = new Float64Array(last - first + 1);
    this.centsAt = new Float64Array(last - first + 1);
  }

  add(month: number, cases: number, cents: number): void {
    this.casesAt[month - this.first]! += cases;
    this.centsAt[month - this.first]! += cents;
    this.sums = null;
  }

  private prefix(): { cases: Float64Array; cents: Float64Array } {
    if (!this.sums) {
      const run = (a: Float64Array) => {
        const out = new Float64Array(a.length + 1);
        a.forEach((v, i) => (out[i + 1] = out[i]! + v));
        return out;
      };
      this.sums = { cases: run(this.casesAt), cents: run(this.centsAt) };
    }
    return this.sums;
  }

  private total(which: 'cases' | 'cents', from: number, to: number): number {
    const a = this.prefix()[which];
    const lo = Math.max(from - this.first, 0);
    const hi = Math.min(to - this.first + 1, a.length - 1);
    return hi > lo ? a[hi]! - a[lo]! : 0;
  }

  /** Cases in months [from, to]. */
  cases(from: number, to: number): number {
    return this.total('cases', from, to);
  }

  /** Whether the window holds hours or cases, i.e. a result row exists for it. */
  published(from: number, to: number): boolean {
    return this.total('cases', from, to) > 0 || this.total('cents', from, to) > 0;
  }

  hasSmallMonth(threshold: number): boolean {
    return this.casesAt.some((c) => c > 0 && c < threshold);
  }
}

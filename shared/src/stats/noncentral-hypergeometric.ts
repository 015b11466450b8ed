/**
 * Fisher's noncentral hypergeometric distribution of the exposed-events cell a of a 2×2 table
 * given all margins, P(A = k; ψ) ∝ C(n1, k) C(n0, m1 − k) ψᵏ for k in [max(0, m1 − n0), min(n1, m1)]
 * (Cornfield 1956; Breslow & Day 1980 Vol I, §4.2). ψ = 1 is the central (Fisher exact test) case.
 * Probabilities are normalized on the log scale so that tables with thousands of subjects work.
 *
 * @example
 * new NoncentralHypergeometric(10, 10, 12).mean(0) // 6 (ψ = 1: n1·m1/N)
 */
import { logChoose } from './distributions';

export class NoncentralHypergeometric {
  readonly lo: number;
  readonly hi: number;
  private readonly logBase: number[];

  constructor(n1: number, n0: number, m1: number) {
    this.lo = Math.max(0, m1 - n0);
    this.hi = Math.min(n1, m1);
    this.logBase = [];
    for (let k = this.lo; k <= this.hi; k++) this.logBase.push(logChoose(n1, k) + logChoose(n0, m1 - k));
  }

  /** Probabilities P(A = lo + i; ψ) for i = 0…hi − lo, with ψ = exp(logPsi). */
  probabilities(logPsi: number): number[] {
    const logW = this.logBase.map((lb, i) => lb + (this.lo + i) * logPsi);
    // reduce, not Math.max(...logW): large supports would overflow the argument list.
    const max = logW.reduce((m, x) => (x > m ? x : m), -Infinity);
    const w = logW.map((x) => Math.exp(x - max));
    const total = w.reduce((s, x) => s + x, 0);
    return w.map((x) => x / total);
  }

  /** E[A; ψ]. */
  mean(logPsi: number): number {
    return this.probabilities(logPsi).reduce((s, p, i) => s + p * (this.lo + i), 0);
  }

  /** P(A ≥ k; ψ). */
  upperTail(k: number, logPsi: number): number {
    return this.probabilities(logPsi).reduce((s, p, i) => (this.lo + i >= k ? s + p : s), 0);
  }

  /** P(A ≤ k; ψ). */
  lowerTail(k: number, logPsi: number): number {
    return this.probabilities(logPsi).reduce((s, p, i) => (this.lo + i <= k ? s + p : s), 0);
  }
}

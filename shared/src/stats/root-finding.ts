/**
 * Brent's method for a root of a continuous function on a bracketing interval, used only
 * where a limit has no closed form (mid-p limits, the conditional MLE and exact limits of the
 * odds ratio, score-inversion intervals). Brent RP. Algorithms for Minimization without
 * Derivatives, 1973, ch. 4 (the "zeroin" algorithm).
 *
 * @example
 * brentRoot((x) => x * x - 2, 0, 2) // 1.414213562373095
 */
export function brentRoot(f: (x: number) => number, lo: number, hi: number, tolerance = 1e-14, maxIterations = 300): number {
  let a = lo;
  let b = hi;
  let fa = f(a);
  let fb = f(b);
  if (fa === 0) return a;
  if (fb === 0) return b;
  if (Math.sign(fa) === Math.sign(fb)) {
    // A caller bug, not a user error: every caller establishes the bracket first.
    throw new RangeError(`brentRoot: interval [${lo}, ${hi}] does not bracket a root`);
  }
  let c = a;
  let fc = fa;
  let d = b - a;
  let e = d;
  for (let i = 0; i < maxIterations; i++) {
    if (Math.sign(fb) === Math.sign(fc)) {
      c = a;
      fc = fa;
      d = b - a;
      e = d;
    }
    if (Math.abs(fc) < Math.abs(fb)) {
      a = b;
      b = c;
      c = a;
      fa = fb;
      fb = fc;
      fc = fa;
    }
    // Tolerance: relative to |b| plus a tiny absolute floor (Brent 1973, eq. 4.2).
    const tol = 2 * Number.EPSILON * Math.abs(b) + tolerance / 2;
    const m = (c - b) / 2;
    if (Math.abs(m) <= tol || fb === 0) return b;
    if (Math.abs(e) >= tol && Math.abs(fa) > Math.abs(fb)) {
      // Inverse quadratic interpolation, or the secant step when only two points differ.
      const s = fb / fa;
      let p: number;
      let q: number;
      if (a === c) {
        p = 2 * m * s;
        q = 1 - s;
      } else {
        const qq = fa / fc;
        const r = fb / fc;
        p = s * (2 * m * qq * (qq - r) - (b - a) * (r - 1));
        q = (qq - 1) * (r - 1) * (s - 1);
      }
      if (p > 0) q = -q;
      else p = -p;
      if (2 * p < Math.min(3 * m * q - Math.abs(tol * q), Math.abs(e * q))) {
        e = d;
        d = p / q;
      } else {
        d = m;
        e = m;
      }
    } else {
      d = m;
      e = m;
    }
    a = b;
    fa = fb;
    b += Math.abs(d) > tol ? d : m > 0 ? tol : -tol;
    fb = f(b);
  }
  return b;
}

/**
 * Root of an increasing function g on the real line, found by expanding a bracket around a
 * starting point and then applying Brent's method. Used on log-scale parameters (log odds,
 * log odds ratio) where the root can be far from the start. Common practice.
 *
 * @example
 * increasingRoot((t) => Math.exp(t) - 10, 0) // 2.302585092994046
 */
export function increasingRoot(g: (t: number) => number, start: number, step = 1, tolerance = 1e-13): number {
  let lo = start - step;
  let hi = start + step;
  let width = step;
  // Expand until g(lo) < 0 < g(hi); g is increasing so this terminates for a finite root.
  for (let i = 0; i < 200 && g(lo) > 0; i++) {
    width *= 2;
    hi = lo;
    lo -= width;
  }
  width = step;
  for (let i = 0; i < 200 && g(hi) < 0; i++) {
    width *= 2;
    lo = hi;
    hi += width;
  }
  return brentRoot(g, lo, hi, tolerance);
}

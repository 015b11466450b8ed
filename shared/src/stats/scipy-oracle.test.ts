/**
 * Live oracle: a few hundred seeded random cases (small counts, zeros, large counts) computed by
 * the core and by SciPy (Debian's python3-scipy, through /usr/bin/python3 and the committed
 * script oracle/scipy_oracle.py), compared to 1e-6 relative. SciPy is required: without it the
 * test fails with instructions.
 */
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { fromJsonNumber } from './json-encoding';
import { compareRates } from './rate-comparison';
import { compareRisks } from './risk-comparison';
import { poissonExactLimits, poissonMidPLimits } from './poisson-limits';
import { standardizedIncidenceRatio } from './sir';

const PYTHON = '/usr/bin/python3';
const SCRIPT = fileURLToPath(new URL('./oracle/scipy_oracle.py', import.meta.url));
const RELATIVE = 1e-6;

/** Seeded PRNG (mulberry32; common practice) so the cases are the same on every run. */
function mulberry32(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (s + 0x6d2b79f5) >>> 0;
    let t = s;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

type OracleCase = { id: string; kind: 'rates' | 'poisson' | 'risks' } & Record<string, number | string>;

function generateCases(): OracleCase[] {
  const rnd = mulberry32(20240601);
  const int = (max: number) => Math.floor(rnd() * (max + 1));
  const count = () => {
    const u = rnd();
    if (u < 0.15) return 0; // zeros
    if (u < 0.65) return int(10); // small counts
    if (u < 0.9) return int(200);
    return int(20000); // large counts
  };
  const conf = () => [0.9, 0.95, 0.99][int(2)]!;
  const cases: OracleCase[] = [];
  for (let i = 0; i < 120; i++) {
    const a = count();
    const b = i === 0 ? 0 : count();
    if (a + b === 0) continue;
    cases.push({ id: `rates-${i}`, kind: 'rates', a, t1: 10 + rnd() * 1e5, b, t0: 10 + rnd() * 1e5, conf: conf() });
  }
  for (let i = 0; i < 60; i++) {
    cases.push({ id: `poisson-${i}`, kind: 'poisson', x: i < 3 ? i : count(), conf: conf(), expected: i % 2 === 0 ? 1 : 0.5 + rnd() * 50 });
  }
  for (let i = 0; i < 140; i++) {
    const n1 = 1 + (rnd() < 0.8 ? int(40) : int(2000));
    const n0 = 1 + (rnd() < 0.8 ? int(40) : int(2000));
    const a = rnd() < 0.15 ? 0 : rnd() < 0.1 ? n1 : int(n1);
    const c = rnd() < 0.15 ? 0 : int(n0);
    if (a + c === 0 || a + c === n1 + n0) continue; // the conditional OR needs both event margins
    cases.push({ id: `risks-${i}`, kind: 'risks', a, b: n1 - a, c, d: n0 - c, conf: conf() });
  }
  return cases;
}

/** The core's values, under the oracle's names. */
function coreValues(c: OracleCase): Record<string, number | null> {
  const n = (k: string) => c[k] as number;
  if (c.kind === 'rates') {
    const r = compareRates({ cases: n('a'), personTime: n('t1') }, { cases: n('b'), personTime: n('t0') }, { confidence: n('conf') });
    return {
      exactLower: r.irr.exact.lower,
      exactUpper: r.irr.exact.upper,
      midPLower: r.irr.midP.lower,
      midPUpper: r.irr.midP.upper,
      pExact: r.irr.pExact,
      pMidP: r.irr.pMidP,
      pExactMinLikelihood: r.irr.pExactMinLikelihood,
      estimate: r.irr.estimate,
      waldLower: r.irr.wald.lower,
      waldUpper: r.irr.wald.upper,
      pWald: r.irr.pWald,
      ird: r.ird.estimate,
      irdLower: r.ird.wald.lower,
      irdUpper: r.ird.wald.upper,
      irdP: r.ird.p,
    };
  }
  if (c.kind === 'poisson') {
    if (n('expected') === 1) {
      const e = poissonExactLimits(n('x'), n('conf'));
      const m = poissonMidPLimits(n('x'), n('conf'));
      return { exactLower: e.lower, exactUpper: e.upper, midPLower: m.lower, midPUpper: m.upper };
    }
    const s = standardizedIncidenceRatio(n('x'), n('expected'), n('conf'));
    return { exactLower: s.exact.lower, exactUpper: s.exact.upper, midPLower: s.midP.lower, midPUpper: s.midP.upper };
  }
  const r = compareRisks({ cases: n('a'), total: n('a') + n('b') }, { cases: n('c'), total: n('c') + n('d') }, n('conf'));
  return {
    newcombeLower: r.rd.newcombe.lower,
    newcombeUpper: r.rd.newcombe.upper,
    rr: r.rr.estimate,
    katzLower: r.rr.katz.lower,
    katzUpper: r.rr.katz.upper,
    or: r.or.estimate,
    woolfLower: r.or.woolf.lower,
    woolfUpper: r.or.woolf.upper,
    orExact: r.or.exact.estimate,
    orExactLower: r.or.exact.lower,
    orExactUpper: r.or.exact.upper,
    pFisher: r.pFisher,
    chi2: r.chiSquare.chi2,
    pChi2: r.pChiSquare,
    chi2Yates: r.chiSquareYates.chi2,
    pChi2Yates: r.pChiSquareYates,
  };
}

function closeEnough(actual: number | null | undefined, expected: number | null): boolean {
  if (expected === null) return actual === null || actual === undefined;
  if (typeof actual !== 'number') return false;
  if (!Number.isFinite(expected)) return actual === expected;
  if (actual === expected) return true;
  // Relative 1e-6; values below 1e-12 in absolute terms are zero for every practical purpose
  // (e.g. a Yates-corrected chi-square of exactly 0 computed as 1e-17 by SciPy).
  return Math.abs(actual - expected) <= RELATIVE * Math.max(Math.abs(expected), Math.abs(actual)) || Math.abs(actual - expected) < 1e-12;
}

describe('SciPy oracle (Debian python3-scipy via /usr/bin/python3)', () => {
  it('agrees with SciPy to 1e-6 relative on every generated case', () => {
    const probe = spawnSync(PYTHON, ['-c', 'import scipy'], { encoding: 'utf8' });
    if (probe.status !== 0) {
      throw new Error(
        `${PYTHON} cannot import scipy (${probe.error?.message ?? probe.stderr.trim()}). Install Debian's python3-scipy ` +
          '(apt-get install python3-scipy; `npm test` does this when run as root).',
      );
    }
    const cases = generateCases();
    expect(cases.length).toBeGreaterThan(250);
    const run = spawnSync(PYTHON, [SCRIPT], { input: JSON.stringify({ cases }), encoding: 'utf8', maxBuffer: 64 * 1024 * 1024 });
    expect(run.status, run.stderr).toBe(0);
    const { results } = JSON.parse(run.stdout) as { results: Array<Record<string, number | string | null>> };
    expect(results.length).toBe(cases.length);
    const mismatches: string[] = [];
    let compared = 0;
    results.forEach((res, i) => {
      const c = cases[i]!;
      const mine = coreValues(c);
      for (const [k, v] of Object.entries(res)) {
        if (k === 'id') continue;
        compared += 1;
        const expected = fromJsonNumber(v as number | string | null);
        if (!closeEnough(mine[k], expected)) mismatches.push(`${c.id} ${JSON.stringify(c)} ${k}: core ${String(mine[k])} vs scipy ${String(expected)}`);
      }
    });
    expect(compared).toBeGreaterThan(2000);
    expect(mismatches, mismatches.slice(0, 20).join('\n')).toEqual([]);
  }, 120_000);
});

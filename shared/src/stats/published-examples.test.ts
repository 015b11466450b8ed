/**
 * Every worked example in shared/test-fixtures/published-examples.json, checked in two parts, each
 * titled with where its numbers come from:
 * - the full-precision values, computed for the fixture with general-purpose reference libraries
 *   (R 4.2.2 and scipy 1.10.1, see the fixture's `about`), within the example's stated tolerance;
 * - the values printed in the cited source (`published`), at the digits printed and no more. Where
 *   the fixture marks an example `confirmed: false`, those values were not read in the source
 *   itself: the title says so.
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { attributableRisk } from './attributable-risk';
import { fisherExactP } from './contingency-tests';
import { incidenceRate } from './incidence-rate';
import { numberNeeded } from './number-needed';
import { oddsRatio } from './odds-ratio';
import { oshaRate } from './person-time';
import { rateDifference } from './rate-difference';
import { rateRatio } from './rate-ratio';
import { riskDifference } from './risk-difference';
import { riskRatio } from './risk-ratio';
import { standardizedIncidenceRatio } from './sir';
import { stratifiedRates } from './stratified-rates';
import { stratifiedRisks } from './stratified-risks';

type Expected = Record<string, number | string | null>;
interface Example {
  id: string;
  measure: string;
  method: string;
  inputs: Record<string, unknown>;
  expected: Expected;
  tolerance: { relative: number; absolute: number };
  source: string;
  published?: Record<string, number>;
  /** True where the `published` numbers were read in the cited source itself. */
  confirmed: boolean;
}

const fixture = JSON.parse(readFileSync(fileURLToPath(new URL('../../test-fixtures/published-examples.json', import.meta.url)), 'utf8')) as {
  cases: Example[];
};

/** Examples the core deliberately does not reproduce, with the reason: none at present, every method in the fixture is implemented. */
const SKIPPED_EXAMPLES: Record<string, string> = {};

type Actual = Record<string, number | null>;
const num = (x: unknown) => x as number;
const rateInputs = (i: Record<string, unknown>) => ({
  exposed: { cases: num(i.cases_exposed), personTime: num(i.pt_exposed) },
  reference: { cases: num(i.cases_ref), personTime: num(i.pt_ref) },
  confidence: (i.conf_level as number | undefined) ?? 0.95,
  per: (i.per as number | undefined) ?? 1,
});
const table = (i: Record<string, unknown>) => ({ a: num(i.a), b: num(i.b), c: num(i.c), d: num(i.d) });
const rateStrata = (i: Record<string, unknown>) =>
  (i.strata as Array<Record<string, number>>).map((s) => ({
    exposed: { cases: s.cases_exposed!, personTime: s.pt_exposed! },
    reference: { cases: s.cases_ref!, personTime: s.pt_ref! },
  }));
const riskStrata = (i: Record<string, unknown>) =>
  (i.strata as Array<Record<string, number>>).map((s) => ({
    exposed: { cases: s.a!, total: s.a! + s.b! },
    reference: { cases: s.c!, total: s.c! + s.d! },
  }));

/** Compute the measures an example states, dispatching on measure and method. */
function compute(ex: Example): Actual {
  const i = ex.inputs;
  const key = `${ex.measure}/${ex.method}`;
  switch (key) {
    case 'IRR/wald_log': {
      const { exposed, reference, confidence } = rateInputs(i);
      const r = rateRatio(exposed, reference, confidence);
      return { estimate: r.estimate, lower: r.wald.lower, upper: r.wald.upper, p: r.pWald };
    }
    case 'IRR/exact_conditional': {
      const { exposed, reference, confidence } = rateInputs(i);
      const r = rateRatio(exposed, reference, confidence);
      return { estimate: r.estimate, lower: r.exact.lower, upper: r.exact.upper, p: r.pExactMinLikelihood, p_doubled: r.pExact };
    }
    case 'IRR/midp_exact': {
      const { exposed, reference, confidence } = rateInputs(i);
      const r = rateRatio(exposed, reference, confidence);
      return { estimate: r.estimate, lower: r.midP.lower, upper: r.midP.upper, p: r.pMidP };
    }
    case 'IRD/wald': {
      const { exposed, reference, confidence, per } = rateInputs(i);
      const r = rateDifference(exposed, reference, confidence, per);
      return { estimate: r.estimate, lower: r.wald.lower, upper: r.wald.upper, p: r.p };
    }
    case 'poisson_mean/exact_garwood':
    case 'poisson_mean/midp': {
      const r = incidenceRate({ cases: num(i.cases), personTime: num(i.pt) }, { confidence: num(i.conf_level) });
      const lim = ex.method === 'midp' ? r.midP : r.exact;
      return { estimate: r.estimate, lower: lim.lower, upper: lim.upper };
    }
    case 'osha_rate/N_x_200000_over_hours': {
      const r = oshaRate(num(i.cases), num(i.hours));
      return { estimate: r.estimate, lower: r.exact.lower, upper: r.exact.upper };
    }
    case 'IRR_MH/mantel_haenszel_greenland_robins': {
      const r = stratifiedRates(rateStrata(i));
      return { estimate: r.mhIrr.estimate, lower: r.mhIrr.lower, upper: r.mhIrr.upper };
    }
    case 'IRR_MH_test/mantel_haenszel_person_time_chi2':
      return { statistic: stratifiedRates(rateStrata(i)).mhIrr.chi2 };
    case 'IRR_homogeneity/score_under_common_mh_irr': {
      const h = stratifiedRates(rateStrata(i)).homogeneity;
      return { statistic: h.chi2, df: h.df };
    }
    case 'SIR/byar': {
      const r = standardizedIncidenceRatio(num(i.observed), num(i.expected), num(i.conf_level));
      return { estimate: r.sir, lower: r.byar.lower, upper: r.byar.upper };
    }
    case 'RD/newcombe_hybrid_score':
    case 'RD/mee_score':
    case 'RD/miettinen_nurminen_score': {
      const r = riskDifference(table(i));
      const lim = ex.method === 'mee_score' ? r.mee : ex.method === 'miettinen_nurminen_score' ? r.miettinenNurminen : r.newcombe;
      return { estimate: r.estimate, lower: lim.lower, upper: lim.upper };
    }
    case 'RR/katz_log': {
      const r = riskRatio(table(i));
      return { estimate: r.estimate, lower: r.katz.lower, upper: r.katz.upper };
    }
    case 'OR/woolf_logit': {
      const r = oddsRatio(table(i));
      return { estimate: r.estimate, lower: r.woolf.lower, upper: r.woolf.upper };
    }
    case 'OR/exact_conditional_fisher': {
      const r = oddsRatio(table(i));
      return { estimate: r.exact.estimate, lower: r.exact.lower, upper: r.exact.upper, p: fisherExactP(table(i)) };
    }
    case 'NNT/altman_inverse_of_newcombe_rd':
    case 'NNT/inverse_of_wald_rd': {
      const rd = riskDifference(table(i));
      const r = numberNeeded(rd.estimate, ex.method === 'inverse_of_wald_rd' ? rd.wald : rd.newcombe);
      return { estimate: r.estimate, lower: r.lower, upper: r.upper };
    }
    case 'AF_exposed/(RR-1)/RR_katz_limits': {
      const r = attributableRisk(table(i)).afExposed;
      return { estimate: r.estimate, lower: r.lower, upper: r.upper };
    }
    case 'PAF/levin_and_miettinen_point': {
      const r = attributableRisk(table(i)).afPopulation;
      return { estimate: r.estimate, lower: r.lower, upper: r.upper };
    }
    case 'OR_MH/mantel_haenszel_RGB_variance': {
      const r = stratifiedRisks(riskStrata(i)).mhOr;
      return { estimate: r.estimate, lower: r.lower, upper: r.upper, p: r.p };
    }
    case 'OR_MH/cmh_with_cc_and_RGB_ci': {
      const r = stratifiedRisks(riskStrata(i));
      return { estimate: r.mhOr.estimate, lower: r.mhOr.lower, upper: r.mhOr.upper, p: r.cmhCorrected.p, statistic: r.cmhCorrected.chi2 };
    }
    case 'OR_homogeneity/woolf': {
      // The published value adds 0.5 to every cell (noted in the example).
      const h = stratifiedRisks(riskStrata(i)).homogeneityWoolfHaldane;
      return { statistic: h.chi2, df: h.df, p: h.p };
    }
    default:
      throw new Error(`no dispatch for ${key}: add it or list it in SKIPPED_EXAMPLES`);
  }
}

function expectClose(actual: number | null | undefined, expected: number | string | null, tol: { relative: number; absolute: number }, label: string): void {
  if (expected === null) return expect(actual, label).toBeNull();
  if (expected === 'Infinity') return expect(actual, label).toBe(Infinity);
  if (expected === '-Infinity') return expect(actual, label).toBe(-Infinity);
  expect(typeof actual, label).toBe('number');
  const e = expected as number;
  const allowed = Math.max(tol.absolute, tol.relative * Math.abs(e));
  expect(Math.abs((actual as number) - e), `${label}: got ${String(actual)}, expected ${e} ± ${allowed}`).toBeLessThanOrEqual(allowed);
}

/** One unit in the last printed decimal: the sources round or truncate (e.g. −8.43 for −8.4359). */
function printedUnit(value: number): number {
  const text = String(value);
  const decimals = text.includes('.') ? text.split('.')[1]!.length : 0;
  return 10 ** -decimals;
}

describe('published worked examples (shared/test-fixtures/published-examples.json)', () => {
  it('the fixture is present and every example names its source and says whether it is confirmed', () => {
    expect(fixture.cases.length).toBeGreaterThan(40);
    for (const ex of fixture.cases) {
      expect(ex.source.length, ex.id).toBeGreaterThan(10);
      expect(typeof ex.confirmed, ex.id).toBe('boolean');
    }
  });

  for (const ex of fixture.cases) {
    if (SKIPPED_EXAMPLES[ex.id]) continue;
    const inputs = ex.source.startsWith('computed with') ? '' : `; inputs from ${ex.source}`;
    it(`${ex.id} — ${ex.measure} ${ex.method} — within relative ${ex.tolerance.relative} of values computed with R 4.2.2 and scipy 1.10.1 (reference libraries)${inputs}`, () => {
      const actual = compute(ex);
      for (const [k, v] of Object.entries(ex.expected)) expectClose(actual[k], v, ex.tolerance, `${ex.id}.${k}`);
    });
    if (!ex.published) continue;
    const printed = ex.confirmed ? `printed in ${ex.source}` : `reported for ${ex.source} — NOT confirmed in the source itself`;
    it(`${ex.id} — ${ex.measure} ${ex.method} — the values ${printed}, at the digits printed`, () => {
      const actual = compute(ex);
      for (const [k, v] of Object.entries(ex.published!)) {
        const a = actual[k];
        expect(typeof a, `${ex.id}.published.${k}`).toBe('number');
        expect(Math.abs((a as number) - v), `${ex.id}.published.${k}: got ${String(a)}, printed ${v}`).toBeLessThanOrEqual(printedUnit(v) * (1 + 1e-9));
      }
    });
  }
});

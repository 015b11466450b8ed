/**
 * One entry point per request kind, producing the response shapes of the CLI (and of any
 * caller that wants the same summary): the fields listed for each kind, plus `kind`,
 * `confidence`, `methods` (how each number was made) and `reasons` (why a value is null, and
 * flags). Numbers may be ±Infinity here; `toJsonValue` encodes them for JSON.
 *
 * @example
 * runStatsRequest({ kind: 'poisson', count: 10 })
 * // { kind: 'poisson', confidence: 0.95, count: 10, exact: { lower: 4.795388696132435, upper: 18.39035604201778 },
 * //   methods: { exact: 'exact Poisson (Garwood 1936)' }, reasons: [] }
 */
import { compareRates, type RateComparisonResult } from './rate-comparison';
import { METHODS } from './methods';
import { poissonExactLimits } from './poisson-limits';
import { rateTrend } from './rate-trend';
import { compareRisks } from './risk-comparison';
import { parseStatsRequest } from './schemas';
import { standardizedIncidenceRatio } from './sir';
import { stratifiedRates } from './stratified-rates';
import { stratifiedRisks } from './stratified-risks';
import { prefixReasons, type Interval } from './result-types';

const interval = (i: Interval) => ({ lower: i.lower, upper: i.upper });

/** The `rates` response body of a comparison (also used for `crude`). */
function ratesBody(r: RateComparisonResult) {
  return {
    rateExposed: { estimate: r.rateExposed.estimate, exact: interval(r.rateExposed.exact) },
    rateReference: { estimate: r.rateReference.estimate, exact: interval(r.rateReference.exact) },
    irr: {
      estimate: r.irr.estimate,
      wald: interval(r.irr.wald),
      exact: interval(r.irr.exact),
      midP: interval(r.irr.midP),
      pExact: r.irr.pExact,
      pMidP: r.irr.pMidP,
      pWald: r.irr.pWald,
    },
    ird: { estimate: r.ird.estimate, wald: interval(r.ird.wald), p: r.ird.p },
    afExposed: r.afExposed.estimate,
    afPopulation: r.afPopulation,
  };
}

const rateMethods = {
  rate: METHODS.rateExact,
  irrWald: METHODS.irrWald,
  irrExact: METHODS.irrExact,
  irrMidP: METHODS.irrMidP,
  pExact: METHODS.pExact,
  pMidP: METHODS.pMidP,
  pWald: METHODS.pWald,
  irdWald: METHODS.irdWald,
  afExposed: METHODS.afExposed,
  afPopulation: METHODS.afPopulation,
};

/**
 * Validate and run one request (throws StatsValidationError on invalid input).
 *
 * @example
 * runStatsRequest({ kind: 'sir', observed: 0, expected: 2 }).exact // { lower: 0, upper: 1.8444397270569677 }
 */
export function runStatsRequest(input: unknown) {
  const req = parseStatsRequest(input);
  const { confidence } = req;
  switch (req.kind) {
    case 'rates': {
      const r = compareRates(req.exposed, req.reference, { confidence, per: req.per });
      return { kind: req.kind, confidence, per: req.per, ...ratesBody(r), methods: rateMethods, reasons: r.reasons };
    }
    case 'stratified-rates': {
      const r = stratifiedRates(req.strata, { confidence, per: req.per });
      return {
        kind: req.kind,
        confidence,
        per: req.per,
        crude: ratesBody(r.crude),
        mhIrr: { estimate: r.mhIrr.estimate, lower: r.mhIrr.lower, upper: r.mhIrr.upper, p: r.mhIrr.p },
        mhIrd: r.mhIrd,
        homogeneity: r.homogeneity,
        droppedStrata: r.droppedStrata,
        methods: { crude: rateMethods, ...r.methods },
        reasons: r.reasons,
      };
    }
    case 'trend': {
      const r = rateTrend(req.levels, { confidence, per: req.per });
      return {
        kind: req.kind,
        confidence,
        per: req.per,
        chi2: r.chi2,
        df: r.df,
        p: r.p,
        levels: r.levels.map((l) => ({ score: l.score, rate: l.rate.estimate, exact: interval(l.rate.exact) })),
        droppedLevels: r.droppedLevels,
        methods: r.methods,
        reasons: [...r.reasons, ...r.levels.flatMap((l, i) => prefixReasons(`levels[${i}].rate`, l.rate.reasons))],
      };
    }
    case 'sir': {
      const r = standardizedIncidenceRatio(req.observed, req.expected, confidence);
      return {
        kind: req.kind,
        confidence,
        sir: r.sir,
        exact: interval(r.exact),
        byar: interval(r.byar),
        methods: { exact: r.methods.exact, byar: r.methods.byar },
        reasons: r.reasons,
      };
    }
    case 'poisson': {
      return {
        kind: req.kind,
        confidence,
        count: req.count,
        exact: poissonExactLimits(req.count, confidence),
        methods: { exact: METHODS.rateExact },
        reasons: [],
      };
    }
    case 'risks': {
      const r = compareRisks(req.exposed, req.reference, confidence);
      return {
        kind: req.kind,
        confidence,
        rd: { estimate: r.rd.estimate, wald: interval(r.rd.wald), newcombe: interval(r.rd.newcombe) },
        rr: { estimate: r.rr.estimate, katz: interval(r.rr.katz) },
        or: { estimate: r.or.estimate, woolf: interval(r.or.woolf), exact: r.or.exact },
        pChiSquare: r.pChiSquare,
        pChiSquareYates: r.pChiSquareYates,
        pFisher: r.pFisher,
        nnt: { estimate: r.nnt.estimate, lower: r.nnt.lower, upper: r.nnt.upper, direction: r.nnt.direction, throughInfinity: r.nnt.throughInfinity },
        methods: {
          rdWald: METHODS.rdWald,
          rdNewcombe: METHODS.rdNewcombe,
          rrKatz: METHODS.rrKatz,
          orWoolf: METHODS.orWoolf,
          orExact: METHODS.orExact,
          ...r.methods,
        },
        reasons: r.reasons,
      };
    }
    case 'stratified-risks': {
      const r = stratifiedRisks(req.strata, confidence);
      return {
        kind: req.kind,
        confidence,
        mhRr: r.mhRr,
        mhOr: { estimate: r.mhOr.estimate, lower: r.mhOr.lower, upper: r.mhOr.upper, p: r.mhOr.p },
        mhRd: r.mhRd,
        homogeneity: r.homogeneity,
        droppedStrata: r.droppedStrata,
        methods: { mhRr: r.methods.mhRr, mhOr: r.methods.mhOr, mhOrTest: r.methods.mhOrTest, mhRd: r.methods.mhRd, homogeneity: r.methods.homogeneity },
        reasons: r.reasons,
      };
    }
  }
}

export type StatsResponse = ReturnType<typeof runStatsRequest>;

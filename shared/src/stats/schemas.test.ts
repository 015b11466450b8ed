import { describe, expect, it } from 'vitest';
import { toJsonValue } from './json-encoding';
import { runStatsRequest } from './run-request';
import { parseStatsRequest } from './schemas';
import { StatsValidationError } from './validation';

describe('request schemas and the request runner', () => {
  it('applies the defaults confidence 0.95 and per 1', () => {
    expect(parseStatsRequest({ kind: 'poisson', count: 10 })).toEqual({ kind: 'poisson', count: 10, confidence: 0.95 });
    const r = parseStatsRequest({ kind: 'rates', exposed: { cases: 1, personTime: 2 }, reference: { cases: 1, personTime: 2 } });
    expect(r.kind === 'rates' && r.per).toBe(1);
  });

  it('lists every issue with its path', () => {
    try {
      parseStatsRequest({ kind: 'risks', exposed: { cases: -1, total: 3 }, reference: { cases: 5, total: 3 }, confidence: 1.5 });
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(StatsValidationError);
      const paths = (e as StatsValidationError).issues.map((i) => i.path);
      expect(paths).toEqual(expect.arrayContaining(['exposed.cases', 'reference', 'confidence']));
    }
  });

  it('rejects NaN, non-integers, unknown kinds and misspelt options', () => {
    expect(() => parseStatsRequest({ kind: 'poisson', count: Number.NaN })).toThrow(StatsValidationError);
    expect(() => parseStatsRequest({ kind: 'poisson', count: 2.5 })).toThrow(StatsValidationError);
    expect(() => parseStatsRequest({ kind: 'nope' })).toThrow(StatsValidationError);
    expect(() => parseStatsRequest({ kind: 'poisson', count: 2, confidnce: 0.9 })).toThrow(/confidnce/);
  });

  it('every response carries kind, confidence, methods and reasons', () => {
    const requests = [
      { kind: 'rates', exposed: { cases: 41, personTime: 28010 }, reference: { cases: 15, personTime: 19017 } },
      { kind: 'stratified-rates', strata: [{ exposed: { cases: 4, personTime: 10 }, reference: { cases: 2, personTime: 10 } }] },
      {
        kind: 'trend',
        levels: [
          { score: 0, cases: 1, personTime: 10 },
          { score: 1, cases: 4, personTime: 10 },
        ],
      },
      { kind: 'sir', observed: 12, expected: 7.4 },
      { kind: 'poisson', count: 10 },
      { kind: 'risks', exposed: { cases: 5, total: 56 }, reference: { cases: 0, total: 29 } },
      { kind: 'stratified-risks', strata: [{ exposed: { cases: 19, total: 52 }, reference: { cases: 4, total: 44 } }] },
    ];
    for (const req of requests) {
      const res = runStatsRequest(req) as Record<string, unknown>;
      expect(res.kind).toBe(req.kind);
      expect(res.confidence).toBe(0.95);
      expect(Object.keys(res.methods as object).length).toBeGreaterThan(0);
      expect(Array.isArray(res.reasons)).toBe(true);
    }
  });

  it('JSON encoding writes infinities as strings and never NaN', () => {
    const res = toJsonValue(runStatsRequest({ kind: 'risks', exposed: { cases: 5, total: 56 }, reference: { cases: 0, total: 29 } })) as Record<
      string,
      Record<string, unknown>
    >;
    expect(res.rr!.estimate).toBe('Infinity');
    expect((res.or!.exact as Record<string, unknown>).upper).toBe('Infinity');
    expect(toJsonValue({ x: -Infinity, y: Number.NaN })).toEqual({ x: '-Infinity', y: null });
  });
});

import { describe, expect, it } from 'vitest';
import { processLine, processLines } from './process-lines';

describe('stats CLI line processing', () => {
  it('answers the rates request with the documented shape (fluoroscopy data, Rothman & Greenland 1998)', () => {
    const out = JSON.parse(processLine('{"kind":"rates","exposed":{"cases":41,"personTime":28010},"reference":{"cases":15,"personTime":19017}}', 1)!);
    expect(Object.keys(out.irr)).toEqual(['estimate', 'wald', 'exact', 'midP', 'pExact', 'pMidP', 'pWald']);
    expect(Object.keys(out.ird)).toEqual(['estimate', 'wald', 'p']);
    expect(out.confidence).toBe(0.95);
    expect(out.per).toBe(1);
    // Full double precision: 1.005684063 (exact lower, R 4.2.2 poisson.test) to 1e-9 relative.
    expect(Math.abs(out.irr.exact.lower / 1.005684063 - 1)).toBeLessThan(1e-9);
  });

  it('writes infinities as "Infinity" and undefined values as null with reasons', () => {
    const out = JSON.parse(processLine('{"kind":"rates","exposed":{"cases":5,"personTime":1000},"reference":{"cases":0,"personTime":2000}}', 1)!);
    expect(out.irr.estimate).toBe('Infinity');
    expect(out.irr.exact.upper).toBe('Infinity');
    expect(out.irr.wald).toEqual({ lower: null, upper: null });
    expect(out.reasons).toContainEqual({ field: 'irr.wald', reason: 'no cases in the reference group (log of 0)' });
  });

  it('keeps order, skips blank lines, and reports a bad line without stopping', () => {
    const out = processLines([
      '{"kind":"poisson","count":0}',
      '',
      'not json',
      '{"kind":"sir","observed":-1,"expected":2}',
      '{"kind":"sir","observed":12,"expected":7.4}',
    ]).map((l) => JSON.parse(l));
    expect(out).toHaveLength(4);
    expect(out[0].exact.upper).toBeCloseTo(3.688879454, 9); // Garwood 1936
    expect(out[1]).toMatchObject({ line: 3, error: { type: 'invalid-json' } });
    expect(out[2]).toMatchObject({ line: 4, error: { type: 'invalid-request', issues: [{ path: 'observed' }] } });
    expect(out[3].sir).toBeCloseTo(12 / 7.4, 14);
  });

  it('answers every request kind', () => {
    const lines = [
      '{"kind":"stratified-rates","strata":[{"exposed":{"cases":4,"personTime":10},"reference":{"cases":2,"personTime":10}},{"exposed":{"cases":3,"personTime":12},"reference":{"cases":1,"personTime":8}}]}',
      '{"kind":"trend","levels":[{"score":0,"cases":10,"personTime":1000},{"score":1,"cases":20,"personTime":1000},{"score":2,"cases":30,"personTime":1000}]}',
      '{"kind":"risks","exposed":{"cases":56,"total":70},"reference":{"cases":48,"total":80}}',
      '{"kind":"stratified-risks","strata":[{"exposed":{"cases":19,"total":52},"reference":{"cases":4,"total":44}},{"exposed":{"cases":6,"total":10},"reference":{"cases":5,"total":16}}]}',
    ];
    const [sr, trend, risks, srisks] = processLines(lines).map((l) => JSON.parse(l));
    expect(Object.keys(sr)).toEqual(expect.arrayContaining(['crude', 'mhIrr', 'mhIrd', 'homogeneity']));
    expect(trend.chi2).toBeCloseTo(10, 12); // hand-computed (see rate-trend.test.ts)
    expect(Object.keys(risks)).toEqual(expect.arrayContaining(['rd', 'rr', 'or', 'pChiSquare', 'pChiSquareYates', 'pFisher', 'nnt']));
    expect(Object.keys(risks.or.exact)).toEqual(['estimate', 'lower', 'upper']);
    expect(Object.keys(srisks)).toEqual(expect.arrayContaining(['mhRr', 'mhOr', 'mhRd', 'homogeneity']));
  });
});

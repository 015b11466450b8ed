import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { stringifyJson, toJsonObject, toJsonValue } from './json-encoding';

describe('JSON encoding of results', () => {
  it('stringifyJson writes what JSON.stringify(toJsonValue(x)) writes (property over nested values with ±∞, NaN and undefined)', () => {
    const leaf = fc.oneof(
      fc.double(),
      fc.constant(Infinity),
      fc.constant(-Infinity),
      fc.constant(Number.NaN),
      fc.string(),
      fc.boolean(),
      fc.constant(null),
      fc.constant(undefined),
    );
    const value = fc.letrec((tie) => ({
      node: fc.oneof({ depthSize: 'small' }, leaf, fc.array(tie('node')), fc.dictionary(fc.string(), tie('node'))),
    })).node;
    fc.assert(
      fc.property(value, (v) => {
        expect(stringifyJson(v)).toBe(JSON.stringify(toJsonValue(v)));
      }),
      { numRuns: 500 },
    );
  });

  it('spells infinities as strings and keeps full precision (the CLI and published-examples convention)', () => {
    expect(stringifyJson({ upper: Infinity, lower: 0.1 + 0.2, p: Number.NaN })).toBe('{"upper":"Infinity","lower":0.30000000000000004,"p":null}');
  });

  it('toJsonObject encodes an object as toJsonValue does, nested infinities included', () => {
    expect(toJsonObject({ upper: Infinity, seconds: { total: -Infinity, p: Number.NaN }, skip: undefined })).toEqual({
      upper: 'Infinity',
      seconds: { total: '-Infinity', p: null },
    });
  });
});

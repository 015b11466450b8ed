import { describe, expect, it } from 'vitest';
import { ageBandEdgesOf, ageBandLabel, ageBandOf } from './age-bands';
import { ageBandEdgesSchema } from './runs';

// Age bands by lower edges, each band closed below and open above (common practice in
// age-standardised tables: "25–34" holds 25 up to 34 completed years).
const edges = [18, 25, 35, 45, 55, 65];

describe('age bands', () => {
  it.each([
    [16, 0],
    [17, 0],
    [18, 18],
    [24, 18],
    [25, 25],
    [64, 55],
    [65, 65],
    [90, 65],
  ])('puts age %i in the band starting at %i', (age, band) => {
    expect(ageBandOf(age, edges)).toBe(band);
  });

  it('names the bands', () => {
    expect([0, 18, 25, 55, 65].map((b) => ageBandLabel(b, edges))).toEqual(['under 18', '18–24', '25–34', '55–64', '65 and over']);
  });

  it('keeps the ten-year bands of earlier runs when no edges are set', () => {
    const decades = ageBandEdgesOf({});
    expect([5, 34, 47, 99].map((a) => ageBandOf(a, decades))).toEqual([0, 30, 40, 90]);
    expect(ageBandLabel(30, decades)).toBe('30–39');
  });

  it.each([
    { name: 'an empty list', value: [] },
    { name: 'a decreasing list', value: [25, 18] },
    { name: 'a repeated edge', value: [18, 18, 25] },
    { name: 'a fraction', value: [18.5] },
    { name: 'zero', value: [0, 18] },
  ])('rejects $name', ({ value }) => {
    expect(ageBandEdgesSchema.safeParse(value).success).toBe(false);
  });
});

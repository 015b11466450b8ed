import { describe, expect, it } from 'vitest';
import { settingsUpdateSchema } from './settings';

const valid = { personTimeBasis: 'person_years', per: 1000, confidence: 0.9, countedStatuses: ['confirmed'], ageBandEdges: [18, 25, 35, 45, 55, 65] };

describe('analysis settings bodies', () => {
  it('accepts a whole version', () => {
    expect(settingsUpdateSchema.parse(valid)).toEqual(valid);
  });

  it.each([
    { name: 'a confidence of 1', patch: { confidence: 1 } },
    { name: 'a confidence given in percent', patch: { confidence: 90 } },
    { name: 'a zero multiplier', patch: { per: 0 } },
    { name: 'no counted status', patch: { countedStatuses: [] } },
    { name: 'a status twice', patch: { countedStatuses: ['confirmed', 'confirmed'] } },
    { name: 'an unknown basis', patch: { personTimeBasis: 'days' } },
    { name: 'decreasing age edges', patch: { ageBandEdges: [65, 18] } },
    { name: 'an unknown key', patch: { window: 'month' } },
  ])('rejects $name', ({ patch }) => {
    expect(settingsUpdateSchema.safeParse({ ...valid, ...patch }).success).toBe(false);
  });
});

import { describe, expect, it } from 'vitest';
import { computeSir, sirScopeKey, type SirDisclosure } from './compute-sir';
import type { SirCell } from './sir-query';

const cell = (siteId: number, observed: number, expected = 10): SirCell => ({
  outcomeId: 1,
  siteId,
  groupId: 7,
  cents: 100_000_00,
  uncoveredCents: 0,
  observed,
  expected,
});
/** Published totals equal to the observed counts (every case covered by a reference rate) unless given. */
const disclosure = (cells: SirCell[], extra: Record<string, number> = {}, framed: string[] = []): SirDisclosure => {
  const totals = new Map<string, number>();
  for (const c of cells) {
    totals.set(sirScopeKey(c.siteId, 1, 7), (totals.get(sirScopeKey(c.siteId, 1, 7)) ?? 0) + c.observed);
    totals.set(sirScopeKey(null, 1, 7), (totals.get(sirScopeKey(null, 1, 7)) ?? 0) + c.observed);
  }
  for (const [k, v] of Object.entries(extra)) totals.set(k, (totals.get(k) ?? 0) + v);
  return { totals, framed: new Set(framed) };
};
const withheld = (cells: SirCell[], d: SirDisclosure) => computeSir(cells, 0.95, 5, d).map((r) => [r.siteId, r.withheld]);

// The small-count rule of the product (counts 1–4 withheld from non-physicians; common practice).
describe('the SIR rows readers other than the physician may see', () => {
  it.each([
    {
      name: 'every count large and covered: all shown',
      cells: [cell(1, 12), cell(2, 9)],
      extra: {},
      framed: [],
      expected: [
        [null, null],
        [1, null],
        [2, null],
      ],
    },
    {
      name: 'one site small: that site small, the others complement (no subtraction from the company)',
      cells: [cell(1, 12), cell(2, 3)],
      extra: {},
      framed: [],
      expected: [
        [null, 'complement'],
        [1, 'complement'],
        [2, 'small'],
      ],
    },
    {
      name: 'a small uncovered count (published 14, SIR observed 12 at site 1): every scope complement',
      cells: [cell(1, 12), cell(2, 9)],
      extra: { [sirScopeKey(1, 1, 7)]: 2, [sirScopeKey(null, 1, 7)]: 2 },
      framed: [],
      expected: [
        [null, 'complement'],
        [1, 'complement'],
        [2, 'complement'],
      ],
    },
    {
      name: 'an uncovered count of 5 is shown',
      cells: [cell(1, 12)],
      extra: { [sirScopeKey(1, 1, 7)]: 5, [sirScopeKey(null, 1, 7)]: 5 },
      framed: [],
      expected: [
        [null, null],
        [1, null],
      ],
    },
    {
      name: 'the frame withholds a month of the group: every scope complement',
      cells: [cell(1, 12)],
      extra: {},
      framed: ['1:7'],
      expected: [
        [null, 'complement'],
        [1, 'complement'],
      ],
    },
    {
      name: 'zero observed is shown (points at nobody)',
      cells: [cell(1, 0)],
      extra: {},
      framed: [],
      expected: [
        [null, null],
        [1, null],
      ],
    },
  ])('$name', ({ cells, extra, framed, expected }) => {
    expect(withheld(cells, disclosure(cells, extra, framed))).toEqual(expected);
  });

  it('the company row sums the sites and carries the SIR with its exact limits (O = 21, E = 20)', () => {
    const cells = [cell(1, 12), cell(2, 9)];
    const company = computeSir(cells, 0.95, 5, disclosure(cells)).find((r) => r.siteId === null)!;
    expect(company).toMatchObject({ observed: 21, expected: 20, sir: 21 / 20 });
    expect(company.exactLower).toBeLessThan(1.05);
    expect(company.exactUpper).toBeGreaterThan(1.05);
  });
});

import type { RunResult } from '@ratewarden/shared/runs';
import { describe, expect, it } from 'vitest';
import { shownResult } from '../shown-result';

const limits = (estimate: number) => ({ estimate, lower: estimate / 2, upper: estimate * 2 });
const row = (over: Partial<RunResult>): RunResult =>
  ({
    cases: 12,
    suppressed: false,
    withheld: null,
    comparisonSuppressed: false,
    personTime: 100,
    rate: limits(120),
    irr: { ...limits(2), p: 0.01, waldLower: 1, waldUpper: 4 },
    ird: { ...limits(60), p: 0.02 },
    ...over,
  }) as RunResult;

describe('a result as a role may see it', () => {
  it('shows every figure of a row nothing is withheld from', () => {
    const s = shownResult(row({}), 'hygienist');
    expect(s).toMatchObject({ hidden: false, comparisonHidden: false, rate: 120, irr: 2, irrP: 0.01, ird: 60 });
    expect(s.cases.text).toBe('12');
  });

  it("keeps the group's own rate but not the comparisons when the reference group's count is withheld", () => {
    const s = shownResult(row({ comparisonSuppressed: true }), 'safety_manager');
    expect(s).toMatchObject({ hidden: false, comparisonHidden: true, rate: 120, irr: null, irrLower: null, irrP: null, ird: null, irdP: null });
  });

  it('withholds everything computed from a withheld count, and says why', () => {
    const small = shownResult(row({ cases: null, suppressed: true, withheld: 'small' }), 'hygienist');
    expect(small).toMatchObject({ hidden: true, comparisonHidden: true, rate: null, irr: null });
    expect(small.cases.text).toBe('<5');
    expect(shownResult(row({ cases: null, suppressed: true, withheld: 'complement' }), 'hygienist').cases.text).toBe('withheld');
  });
});

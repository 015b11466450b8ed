import { describe, expect, it } from 'vitest';
import { standingEscalations, withdrawnBy } from './escalations';

describe('escalations of a flag and their withdrawal', () => {
  it('keeps the level before each escalation, less those a later event withdrew', () => {
    const events = [
      { kind: 'raised', detail: { value: 2 } },
      { kind: 'escalated', detail: { value: 3, previousWorst: 2 } },
      { kind: 'escalated', detail: { value: 4, previousWorst: 3 } },
      { kind: 'eased', detail: { value: 3, withdrawn: 1, previousWorst: 4 } },
      { kind: 'escalated', detail: { value: 5, previousWorst: 3 } },
    ];
    expect(standingEscalations(events)).toEqual([2, 3]);
    expect(standingEscalations(events.slice(0, 4))).toEqual([2]);
  });

  it('a value at or below the level before an escalation withdraws it, and every later one', () => {
    expect(withdrawnBy([2, 3], 3.5)).toBeNull(); // still worse than before the last escalation
    expect(withdrawnBy([2, 3], 3)).toEqual({ withdrawn: 1, worstBefore: 3 });
    expect(withdrawnBy([2, 3], 1.5)).toEqual({ withdrawn: 2, worstBefore: 2 });
    expect(withdrawnBy([], 1)).toBeNull();
  });
});

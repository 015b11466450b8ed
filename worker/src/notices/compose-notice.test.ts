import { describe, expect, it } from 'vitest';
import { composeNotice, type NoticeFacts } from './compose-notice';

const facts: NoticeFacts = {
  flagId: '00000000-0000-4000-8000-000000000001',
  kind: 'raised',
  ruleName: 'Dermatitis rate above 20',
  measure: 'rate',
  thresholdOn: 'lower_bound',
  threshold: 20,
  window: 'rolling12',
  period: '2031-05-01',
  groupCode: 'WET',
  groupName: 'Wet work',
  value: 21.5,
  estimate: 64.2,
  lower: 21.5,
  upper: 149.8,
  cases: 4,
  expected: 1.1,
  personTime: 62.3,
  settings: { personTimeBasis: 'person_years', per: 1000, confidence: 0.95, countedStatuses: ['confirmed'] },
  appUrl: 'https://ratewarden.example/',
};

describe('threshold notice text', () => {
  it('names the rule, group and period, gives the aggregate figures and a sign-in link', () => {
    const { subject, text } = composeNotice(facts);
    expect(subject).toBe('Ratewarden: watch rule "Dermatitis rate above 20" raised a flag for Wet work');
    expect(text).toContain('Period: 12 months ending 2031-05');
    expect(text).toContain('Cases in the group: 4; expected at the reference rate: 1.1');
    expect(text).toContain('Value: 21.50 (estimate 64.20, 95% interval 21.50 to 149.80)');
    expect(text).toContain('Sign in to review the flag: https://ratewarden.example/flags/00000000-0000-4000-8000-000000000001');
  });

  it('with the figures withheld, leaves out the small count and every figure computed from it', () => {
    const { text } = composeNotice({ ...facts, withholdFigures: { threshold: 5 } });
    expect(text).toContain('Cases in the group: fewer than 5');
    for (const figure of ['21.5', '64.2', '149.8', '1.1', 'Value:']) expect(text).not.toContain(figure);
    expect(text).toContain('Person-time: 62.3 person-years');
  });
});

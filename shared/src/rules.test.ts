import { describe, expect, it } from 'vitest';
import { watchRuleInputSchema } from './rules';

describe('watch rule validation', () => {
  it('names the field at fault in words people read in the form', () => {
    const r = watchRuleInputSchema.safeParse({ name: ' ', outcomeId: 1, measure: 'irr', threshold: Number.NaN, minCases: -2, recipients: ['not-an-address'] });
    expect(r.success).toBe(false);
    const messages = Object.fromEntries(r.error!.issues.map((i) => [i.path.join('.'), i.message]));
    expect(messages).toMatchObject({
      name: 'give the rule a name',
      threshold: 'enter a number, e.g. 1.5',
      minCases: 'enter a whole number from 0 to 100,000',
      'recipients.0': 'not an e-mail address',
    });
  });

  it('needs a threshold except for u-chart rules, which work on single months', () => {
    expect(watchRuleInputSchema.safeParse({ name: 'r', outcomeId: 1, measure: 'rate' }).error?.issues[0]).toMatchObject({ path: ['threshold'] });
    expect(watchRuleInputSchema.safeParse({ name: 'u', outcomeId: 1, measure: 'uchart', window: 'month' }).success).toBe(true);
    expect(watchRuleInputSchema.safeParse({ name: 'u', outcomeId: 1, measure: 'uchart', window: 'rolling12' }).error?.issues[0]).toMatchObject({ path: ['window'] });
  });
});

import { describe, expect, it } from 'vitest';
import { watchRuleInputSchema, watchRulePatchSchema, watchRuleSchemas } from './rules';

describe('watch rule validation', () => {
  it('names the field at fault in words people read in the form', () => {
    const r = watchRuleInputSchema.safeParse({ name: ' ', outcomeId: 1, measure: 'irr', threshold: Number.NaN, minCases: 2.5, recipients: ['not-an-address'] });
    expect(r.success).toBe(false);
    const messages = Object.fromEntries(r.error!.issues.map((i) => [i.path.join('.'), i.message]));
    expect(messages).toMatchObject({
      name: 'give the rule a name',
      threshold: 'enter a number, e.g. 1.5',
      minCases: 'enter a whole number from 5 to 100,000',
      'recipients.0': 'not an e-mail address',
    });
  });

  it('needs a threshold except for u-chart rules, which work on single months', () => {
    expect(watchRuleInputSchema.safeParse({ name: 'r', outcomeId: 1, measure: 'rate' }).error?.issues[0]).toMatchObject({ path: ['threshold'] });
    expect(watchRuleInputSchema.safeParse({ name: 'u', outcomeId: 1, measure: 'uchart', window: 'month' }).success).toBe(true);
    expect(watchRuleInputSchema.safeParse({ name: 'u', outcomeId: 1, measure: 'uchart', window: 'rolling12' }).error?.issues[0]).toMatchObject({
      path: ['window'],
    });
  });

  const rule = { name: 'r', outcomeId: 1, measure: 'irr', threshold: 1 };

  it.each([0, 1, 2, 3, 4])('refuses a minimum of %i cases: it would select on counts withheld from readers', (minCases) => {
    const issue = watchRuleInputSchema.safeParse({ ...rule, minCases }).error?.issues[0];
    expect(issue).toMatchObject({ path: ['minCases'], message: 'at least 5: smaller counts are withheld from everyone but the physician' });
    expect(watchRulePatchSchema.safeParse({ minCases }).success).toBe(false);
  });

  it('takes 5 cases, and 5 by default', () => {
    expect(watchRuleInputSchema.parse({ ...rule, minCases: 5 }).minCases).toBe(5);
    expect(watchRuleInputSchema.parse(rule).minCases).toBe(5);
  });

  it('follows the configured small-cell threshold', () => {
    const { input, patch } = watchRuleSchemas(8);
    expect(input.parse(rule).minCases).toBe(8);
    expect(input.safeParse({ ...rule, minCases: 7 }).error?.issues[0]?.message).toBe('at least 8: smaller counts are withheld from everyone but the physician');
    expect(patch.safeParse({ minCases: 7 }).success).toBe(false);
    expect(patch.parse({ minCases: 8 })).toEqual({ minCases: 8 });
  });

  it('patches carry only the fields given (no defaults overwrite stored ones) and refuse unknown ones', () => {
    expect(watchRulePatchSchema.parse({ name: ' renamed ' })).toEqual({ name: 'renamed' });
    expect(watchRulePatchSchema.safeParse({ nmae: 'x' }).error?.issues[0]).toMatchObject({ code: 'unrecognized_keys', keys: ['nmae'] });
    expect(watchRuleInputSchema.safeParse({ ...rule, owner: 'me' }).error?.issues[0]).toMatchObject({ code: 'unrecognized_keys', keys: ['owner'] });
  });

  it('watches the company by default, or chosen sites, each once and in order; no empty choice', () => {
    expect(watchRuleInputSchema.parse(rule).siteIds).toBeNull();
    expect(watchRuleInputSchema.parse({ ...rule, siteIds: [4, 2, 4] }).siteIds).toEqual([2, 4]);
    expect(watchRuleInputSchema.safeParse({ ...rule, siteIds: [] }).error?.issues[0]).toMatchObject({
      path: ['siteIds'],
      message: 'choose at least one site, or watch the whole company',
    });
    expect(watchRulePatchSchema.parse({ siteIds: null })).toEqual({ siteIds: null });
    expect(watchRulePatchSchema.parse({ name: 'x' })).not.toHaveProperty('siteIds');
  });
});

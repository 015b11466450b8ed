import { describe, expect, it } from 'vitest';
import { composeMail, composeNotice, type NoticeFacts } from './compose-notice';

const facts: NoticeFacts = {
  flagId: '00000000-0000-4000-8000-000000000001',
  kind: 'raised',
  ruleName: 'Dermatitis rate above 20',
  measure: 'rate',
  thresholdOn: 'lower_bound',
  threshold: 20,
  window: 'rolling12',
  period: '2031-05-01',
  completeness: 'complete',
  groupCode: 'WET',
  groupName: 'Wet work',
  site: null,
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
  it('names the rule, group, scope and period with its completeness, gives the aggregate figures and a sign-in link', () => {
    const { subject, text } = composeNotice(facts);
    expect(subject).toBe('Ratewarden: watch rule "Dermatitis rate above 20" raised a flag for Wet work');
    expect(text).toContain('Scope: the whole company');
    expect(text).toContain('Period: 12 months ending May 2031, complete');
    expect(text).toContain('Cases in the group: 4; expected at the reference rate: 1.1');
    expect(text).toContain('Value: 21.5 (estimate 64.2, 95% interval 21.5 to 150)');
    expect(text).toContain('Sign in to review the flag: https://ratewarden.example/flags/00000000-0000-4000-8000-000000000001');
  });

  it('says when the period was partial, and names the site of a site flag', () => {
    const { subject, text } = composeNotice({
      ...facts,
      window: 'month',
      period: '2031-12-01',
      completeness: 'partial',
      site: { code: 'NF', name: 'North Foundry' },
    });
    expect(subject).toBe('Ratewarden: watch rule "Dermatitis rate above 20" raised a flag for Wet work at North Foundry');
    expect(text).toContain('Period: month of Dec 2031, partial (a roster or case list of the period was not in when the run read it)');
    expect(text).toContain("Site: North Foundry (NF), on this site's own results");
    expect(text).not.toContain('whole company');
  });

  it('with the figures withheld, leaves out the small count and every figure computed from it', () => {
    const { text } = composeNotice({ ...facts, withholdFigures: { threshold: 5 } });
    expect(text).toContain('Cases in the group: fewer than 5');
    for (const figure of ['21.5', '64.2', '149.8', '1.1', 'Value:']) expect(text).not.toContain(figure);
    expect(text).toContain('Person-time: 62.3 person-years');
  });

  it('follow-ups say what a later run found, with the figures withheld alike', () => {
    const eased = composeNotice({ ...facts, kind: 'eased' });
    expect(eased.subject).toBe('Ratewarden: watch rule "Dermatitis rate above 20" follow-up, worsening withdrawn for Wet work');
    expect(eased.text.split('\n')[0]).toMatch(/^Follow-up: a later run no longer supports the worsening reported earlier/);
    const cleared = composeNotice({ ...facts, kind: 'cleared', value: 12.5, withholdFigures: { threshold: 5 } });
    expect(cleared.subject).toContain('follow-up, no longer past the rule');
    expect(cleared.text).toContain('no longer past its watch rule');
    for (const figure of ['12.5', '64.2', 'Value:']) expect(cleared.text).not.toContain(figure);
    const again = composeNotice({ ...facts, kind: 'crossed_again', value: null });
    expect(again.subject).toContain('flag past the rule again');
    expect(again.text).toContain('Value: not defined');
  });

  it('the e-mail says only that there is a notice, and links to it in the inbox', () => {
    const id = '00000000-0000-4000-8000-00000000000a';
    const mail = composeMail('raised', id, 'https://ratewarden.example/');
    expect(mail.subject).toBe('Ratewarden: a new threshold notice for you');
    expect(mail.text).toContain(`https://ratewarden.example/notices/${id}`);
    // Nothing of the notice itself: no rule, group, period or figure.
    const notice = composeNotice(facts);
    for (const part of ['Dermatitis', 'Wet work', 'May 2031', 'Cases', '21.5', 'Value']) expect(`${mail.subject}\n${mail.text}`).not.toContain(part);
    expect(notice.text).toContain('Dermatitis');
    expect(composeMail('cleared', id, 'https://ratewarden.example').subject).toBe('Ratewarden: a follow-up notice for you');
  });
});

import { describe, expect, it } from 'vitest';
import type { ResultRow } from '../runs/compute-results';
import { evaluateRule, type RuleToEvaluate } from './evaluate-rules';

/** A result row with only what rule evaluation reads; the rest left empty. */
function row(siteId: number | null, groupId: number, periodIndex: number, p: number, over: Partial<ResultRow> = {}): ResultRow {
  const period = `2031-${String(periodIndex).padStart(2, '0')}-01`;
  return {
    site_id: siteId,
    outcome_id: 7,
    exposure_group_id: groupId,
    window_kind: 'rolling12',
    period,
    periodIndex,
    months_covered: 12,
    is_reference: false,
    reference_group_id: 1,
    cases: 12,
    hours: '0',
    person_time: 3,
    rate: 4,
    rate_lower: 2,
    rate_upper: 7,
    expected: 5,
    irr: 2.4,
    irr_lower: 1.2,
    irr_upper: 4.6,
    irr_p: p,
    irr_wald_lower: null,
    irr_wald_upper: null,
    ird: null,
    ird_lower: null,
    ird_upper: null,
    ird_p: null,
    mh_age_irr: null,
    mh_age_irr_lower: null,
    mh_age_irr_upper: null,
    mh_age_irr_p: null,
    mh_age_ird: null,
    mh_age_ird_lower: null,
    mh_age_ird_upper: null,
    mh_site_irr: null,
    mh_site_irr_lower: null,
    mh_site_irr_upper: null,
    mh_site_irr_p: null,
    mh_site_ird: null,
    mh_site_ird_lower: null,
    mh_site_ird_upper: null,
    mh_sex_irr: null,
    mh_sex_irr_lower: null,
    mh_sex_irr_upper: null,
    mh_sex_irr_p: null,
    mh_sex_ird: null,
    mh_sex_ird_lower: null,
    mh_sex_ird_upper: null,
    u_centre: null,
    u_lcl: null,
    u_ucl: null,
    u_signal: null,
    detail: {},
    ...over,
  };
}

const rule = (over: Partial<RuleToEvaluate> = {}): RuleToEvaluate => ({
  id: 'rule',
  outcomeId: 7,
  exposureGroupId: null,
  siteIds: null,
  measure: 'irr',
  thresholdOn: 'estimate',
  threshold: 1,
  minCases: 5,
  minExpected: 0,
  windowKind: 'rolling12',
  consecutivePeriods: 1,
  fdrControl: false,
  fdrLevel: 0.05,
  ...over,
});

const byScope = (vs: ReturnType<typeof evaluateRule>) => Object.fromEntries(vs.map((v) => [`${v.siteId ?? 'all'}:${v.exposureGroupId}`, v]));

describe('watch rules on the company and on chosen sites', () => {
  it('a company-wide rule reads the company rows only; a site rule reads each chosen site on its own rows', () => {
    const rows = [
      row(null, 2, 12, 0.3, { irr: 0.9 }), // the company: diluted, not past 1
      row(11, 2, 12, 0.001, { irr: 3.1 }), // site 11's own excess
      row(12, 2, 12, 0.5, { irr: 0.6 }),
      row(13, 2, 12, 0.001, { irr: 5 }), // a site the rule does not watch
    ];
    expect(evaluateRule(rule(), rows).map((v) => [v.siteId, v.crossing, v.value])).toEqual([[null, false, 0.9]]);
    const site = byScope(evaluateRule(rule({ siteIds: [12, 11] }), rows));
    expect(Object.keys(site).sort()).toEqual(['11:2', '12:2']);
    expect(site['11:2']).toMatchObject({ siteId: 11, crossing: true, value: 3.1, cases: 12, period: '2031-12-01' });
    expect(site['12:2']).toMatchObject({ siteId: 12, crossing: false, value: 0.6 });
  });

  it('one Benjamini–Hochberg family per rule and period: every group × every chosen site', () => {
    // p of groups 2 and 3 at sites 11 and 12. Across the four (m = 4), by the step-up of Benjamini
    // & Hochberg (1995), worked by hand: sorted 0.01, 0.03, 0.04, 0.2 → 0.04, 0.06, 0.0533, 0.2,
    // cumulative minimum from the top → q 0.04, 0.16/3, 0.16/3, 0.2 (the same numbers as
    // shared/src/stats/multiple-comparisons.test.ts). Site 11 alone (m = 2) would give 0.02, 0.04
    // and both of its groups would pass at 0.05; in the joint family only 2@11 does.
    const rows = [row(11, 2, 12, 0.01), row(11, 3, 12, 0.04), row(12, 2, 12, 0.03), row(12, 3, 12, 0.2)];
    const v = byScope(evaluateRule(rule({ siteIds: [11, 12], fdrControl: true, fdrLevel: 0.05 }), rows));
    expect(v['11:2']!.q).toBeCloseTo(0.04, 12);
    expect(v['11:3']!.q).toBeCloseTo(0.16 / 3, 12);
    expect(v['12:2']!.q).toBeCloseTo(0.16 / 3, 12);
    expect(v['12:3']!.q).toBeCloseTo(0.2, 12);
    expect(
      Object.entries(v)
        .filter(([, x]) => x.crossing)
        .map(([k]) => k),
    ).toEqual(['11:2']);
    // The same rule on site 11 alone: its own family of two.
    const alone = byScope(evaluateRule(rule({ siteIds: [11], fdrControl: true, fdrLevel: 0.05 }), rows));
    expect([alone['11:2']!.q, alone['11:3']!.q]).toEqual([0.02, 0.04]);
    expect([alone['11:2']!.crossing, alone['11:3']!.crossing]).toEqual([true, true]);
  });

  it('consecutive periods and minimum cases hold per group × site; the latest period is the latest of any chosen site', () => {
    const rows = [
      row(11, 2, 11, 0.01),
      row(11, 2, 12, 0.01),
      row(12, 2, 11, 0.01, { irr: 0.8 }),
      row(12, 2, 12, 0.01), // past the rule in the latest period only
      row(13, 2, 11, 0.01), // nothing in the latest period (left out as partial, say): no verdict
      row(14, 2, 11, 0.01),
      row(14, 2, 12, 0.01, { cases: 4 }),
    ];
    const v = byScope(evaluateRule(rule({ siteIds: [11, 12, 13, 14], consecutivePeriods: 2 }), rows));
    expect(Object.keys(v).sort()).toEqual(['11:2', '12:2', '14:2']);
    expect([v['11:2']!.crossing, v['12:2']!.crossing, v['14:2']!.crossing]).toEqual([true, false, false]);
  });
});

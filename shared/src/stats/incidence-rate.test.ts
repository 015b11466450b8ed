import { describe, expect, it } from 'vitest';
import { incidenceRate } from './incidence-rate';
import { daysToPersonYears, hoursToOshaUnits, hoursToPersonYears, monthsToPersonYears, oshaRate, personTimeOfHours } from './person-time';
import { poissonByarLimits, poissonMidPLimits } from './poisson-limits';
import { expectRelClose } from './test-helpers';
import { StatsValidationError } from './validation';

describe('incidence rate of one group', () => {
  it('rate per 1,000 with Garwood limits', () => {
    const r = incidenceRate({ cases: 10, personTime: 2000 }, { per: 1000 });
    expect(r.estimate).toBe(5);
    expectRelClose(r.exact.lower, 4.795388696 / 2, 1e-8); // Garwood 1936; 95% limits for x = 10 are 4.795–18.39
    expectRelClose(r.exact.upper, 18.39035604 / 2, 1e-8); // Garwood 1936
    expect(r.methods.exact).toMatch(/Garwood/);
    expect(r.confidence).toBe(0.95);
  });

  it('x = 0 is a legitimate rate: estimate 0, upper limit 3.689/T', () => {
    const r = incidenceRate({ cases: 0, personTime: 0.5 });
    expect(r.estimate).toBe(0);
    expect(r.exact.lower).toBe(0);
    expectRelClose(r.exact.upper, 3.688879454 / 0.5, 1e-8); // −ln(0.025) = 3.689 (Garwood 1936)
  });

  it('zero person-time leaves the rate undefined, with a reason', () => {
    const r = incidenceRate({ cases: 0, personTime: 0 });
    expect(r.estimate).toBeNull();
    expect(r.exact).toEqual({ lower: null, upper: null });
    expect(r.reasons[0]).toEqual({ field: 'estimate', reason: 'no person-time' });
  });

  it('rejects invalid input with a typed error', () => {
    expect(() => incidenceRate({ cases: -1, personTime: 10 })).toThrow(StatsValidationError);
    expect(() => incidenceRate({ cases: 1.5, personTime: 10 })).toThrow(/non-negative integer/);
    expect(() => incidenceRate({ cases: 1, personTime: Number.NaN })).toThrow(StatsValidationError);
    expect(() => incidenceRate({ cases: 3, personTime: 0 })).toThrow(/zero person-time/);
    expect(() => incidenceRate({ cases: 1, personTime: 1 }, { confidence: 1 })).toThrow(/between 0 and 1/);
  });

  it('Byar is within 0.2% of exact for x ≥ 10 (Rothman & Boice 1979)', () => {
    const b = poissonByarLimits(10, 0.95);
    expectRelClose(b.lower, 4.795388696, 2e-3);
    expectRelClose(b.upper, 18.39035604, 2e-3);
  });

  it('mid-p limits at x = 0: upper = −ln α (closed form)', () => {
    expectRelClose(poissonMidPLimits(0, 0.9).upper, -Math.log(0.1), 1e-12);
  });
});

describe('person-time conversions and the OSHA/BLS rate', () => {
  it('converts hours on either basis of a run (2,000 h a person-year; 200,000 h a unit: common practice, OSHA recordkeeping)', () => {
    expect(personTimeOfHours(300_000, 'person_years')).toBe(150);
    expect(personTimeOfHours(300_000, 'hours_200k')).toBe(1.5);
  });

  it('conversions', () => {
    expect(hoursToPersonYears(300_000)).toBe(150); // 2,000 h per full-time year (40 h × 50 wk; 29 CFR 1904)
    expect(monthsToPersonYears(18)).toBe(1.5);
    expect(daysToPersonYears(730.5)).toBe(2); // 365.25 d per year (common practice)
    expect(hoursToOshaUnits(300_000)).toBe(1.5);
  });

  it('OSHA rate: 6 cases in 300,000 h = 4.0 (BLS "How to compute a firm\'s incidence rate")', () => {
    const r = oshaRate(6, 300_000);
    expect(r.estimate).toBe(4);
    expectRelClose(r.exact.lower, 1.467929502, 1e-8); // exact limits on 6 scaled by 200,000/EH (computed, R 4.2.2)
  });

  it('no hours: undefined, with a reason', () => {
    expect(oshaRate(0, 0).estimate).toBeNull();
  });
});

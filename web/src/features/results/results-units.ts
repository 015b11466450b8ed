import type { RunSettings } from '@ratewarden/shared/runs';
import { METHODS } from '@ratewarden/shared/stats/methods';
import type { UnitsSettings } from '../../components/units/units-strip';

/** The settings a run computed with, worded for the units strip beside its figures. */
const grouped = new Intl.NumberFormat('en-GB');

export function rateUnit(s: Pick<RunSettings, 'personTimeBasis' | 'per'>): string {
  if (s.personTimeBasis === 'person_years') return `per ${grouped.format(s.per)} person-years`;
  return s.per === 1 ? 'per 200,000 hours worked' : `per ${grouped.format(s.per * 200_000)} hours worked`;
}

export function personTimeUnit(s: Pick<RunSettings, 'personTimeBasis'>): string {
  return s.personTimeBasis === 'person_years' ? 'person-years' : 'units of 200,000 h';
}

export function unitsOf(s: RunSettings, settingsVersion: number | null): UnitsSettings {
  return {
    settingsVersion,
    basis:
      s.personTimeBasis === 'person_years'
        ? 'person-years (2,000 h worked = 1 person-year)'
        : 'hours worked, in units of 200,000 h (100 full-time workers for a year)',
    multiplier: rateUnit(s),
    confidence: s.confidence,
    intervalMethod: `rates ${METHODS.rateExact}; IRR ${METHODS.irrExact.split(' (')[0]}; IRD ${METHODS.irdWald}`,
  };
}

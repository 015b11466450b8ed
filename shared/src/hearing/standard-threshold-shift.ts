/**
 * Standard threshold shift of one ear, 29 CFR 1910.95(g)(10)(i): "a change in hearing threshold
 * relative to the baseline audiogram of an average of 10 dB or more at 2000, 3000, and 4000 Hz in
 * either ear", with the optional allowance for aging of (g)(10)(ii) and Appendix F; and whether it
 * is recordable under 29 CFR 1904.10(a): the employee's total hearing level is also 25 dB or more
 * above audiometric zero, averaged at 2000, 3000 and 4000 Hz, in the same ear. The 25 dB test reads
 * the most recent audiogram as measured, never age-corrected (1904.10(b)(3)).
 *
 * @example
 * standardThresholdShift({ 2000: 0, 3000: 0, 4000: 5 }, { 2000: 10, 3000: 10, 4000: 25 }, { 2000: 1, 3000: 1, 4000: 3 })
 * // { averageChange: 11.666…, shift: true, recentAverage: 15, recordable: false, ... }
 */
import { STS_FREQUENCIES, average234, type StsFrequency } from './audiogram';

/** 1910.95(g)(10)(i). */
export const STS_AVERAGE_CHANGE_DB = 10;
/** 1904.10(a). */
export const RECORDABLE_HEARING_LEVEL_DB = 25;

export interface ShiftComputation {
  baseline: Record<StsFrequency, number>;
  recent: Record<StsFrequency, number>;
  /** Appendix F correction subtracted from the recent thresholds; zeros when none was applied. */
  correction: Record<StsFrequency, number>;
  /** recent − correction − baseline per frequency. */
  change: Record<StsFrequency, number>;
  averageChange: number;
  shift: boolean;
  /** Average of the recent thresholds as measured (no age correction). */
  recentAverage: number;
  recordable: boolean;
}

const NO_CORRECTION: Record<StsFrequency, number> = { 2000: 0, 3000: 0, 4000: 0 };

export function standardThresholdShift(
  baseline: Record<StsFrequency, number>,
  recent: Record<StsFrequency, number>,
  correction: Record<StsFrequency, number> = NO_CORRECTION,
): ShiftComputation {
  const change = {} as Record<StsFrequency, number>;
  for (const f of STS_FREQUENCIES) change[f] = recent[f] - correction[f] - baseline[f];
  const averageChange = average234(change);
  // Compared on the sum of three integers (×3) so that 30/3 is not lost to a rounding of 10.
  const shift = change[2000] + change[3000] + change[4000] >= 3 * STS_AVERAGE_CHANGE_DB;
  const recentAverage = average234(recent);
  const recordable = shift && recent[2000] + recent[3000] + recent[4000] >= 3 * RECORDABLE_HEARING_LEVEL_DB;
  return {
    baseline: { ...baseline },
    recent: { ...recent },
    correction: { ...correction },
    change,
    averageChange,
    shift,
    recentAverage,
    recordable,
  };
}

/** A change at least as large as a shift the other way: the baseline may be revised for improvement. */
export const IMPROVEMENT_AVERAGE_DB = 5;

/**
 * Whether an ear's recent test is markedly better than its baseline: average at 2000, 3000 and
 * 4000 Hz at least 5 dB better (1910.95(g)(9)(ii) allows a revision for "significant improvement"
 * without a number; 5 dB is common practice).
 */
export function isImprovement(baseline: Record<StsFrequency, number>, recent: Record<StsFrequency, number>): boolean {
  let sum = 0;
  for (const f of STS_FREQUENCIES) sum += baseline[f] - recent[f];
  return sum >= 3 * IMPROVEMENT_AVERAGE_DB;
}

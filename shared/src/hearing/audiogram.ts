/**
 * The shape of an audiogram as the hearing module reads it: pure-tone air-conduction thresholds in
 * dB HL per ear. The frequencies are those 29 CFR 1910.95(h)(1) requires (500 to 6000 Hz), plus
 * 8000 Hz where a test has it.
 */
export const AUDIOGRAM_FREQUENCIES = [500, 1000, 2000, 3000, 4000, 6000, 8000] as const;
export type AudiogramFrequency = (typeof AUDIOGRAM_FREQUENCIES)[number];

/** 29 CFR 1910.95(g)(10)(i): the standard threshold shift is read at 2000, 3000 and 4000 Hz. */
export const STS_FREQUENCIES = [2000, 3000, 4000] as const;
export type StsFrequency = (typeof STS_FREQUENCIES)[number];

export type Ear = 'left' | 'right';
export const EARS: readonly Ear[] = ['left', 'right'];

/** baseline: 1910.95(g)(5); annual: (g)(6); retest: (g)(7)(ii), within 30 days of an annual. */
export type AudiogramTestType = 'baseline' | 'annual' | 'retest';

/** Thresholds of one ear; 8000 Hz is optional, every other frequency is required. */
export type EarThresholds = Record<Exclude<AudiogramFrequency, 8000>, number> & { 8000?: number | null };

/** One ear of one test. */
export interface EarAudiogram {
  /** Stable identifier of the stored row (for the computation's trail). */
  id: string;
  testDate: string;
  ear: Ear;
  testType: AudiogramTestType;
  thresholds: EarThresholds;
}

/** Limits of the intake's thresholds: −10 to 120 dB HL in steps of 5 dB (common practice: audiometers step in 5 dB). */
export const THRESHOLD_MIN_DB = -10;
export const THRESHOLD_MAX_DB = 120;
export const THRESHOLD_STEP_DB = 5;

/**
 * Mean of the thresholds at 2000, 3000 and 4000 Hz.
 * @example average234({ 2000: 10, 3000: 10, 4000: 25 }) // 15
 */
export function average234(values: Record<StsFrequency, number>): number {
  return (values[2000] + values[3000] + values[4000]) / 3;
}

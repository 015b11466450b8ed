/**
 * Age correction of 29 CFR 1910.95 Appendix F: the part of a change in hearing that may be due to
 * aging is the table value at the age of the most recent audiogram minus the value at the age of the
 * baseline (steps I and II); it is subtracted from the most recent audiogram (1910.95(g)(10)(ii)).
 * Ages below 20 read the "20 or younger" row, above 60 the "60 or older" row.
 *
 * @returns the correction at 2000, 3000, 4000 Hz, or `null` with the reason when it cannot be
 *   given (sex other than F/M, unknown age, a table value missing from the stored source).
 * @example ageCorrection234('M', 27, 32) // { ok: true, values: { 2000: 1, 3000: 1, 4000: 3 }, ... }
 */
import { STS_FREQUENCIES, type StsFrequency } from './audiogram';
import {
  CORRECTION_FREQUENCIES,
  TABLE_F1_MALES,
  TABLE_F2_FEMALES,
  TABLE_MAX_AGE,
  TABLE_MIN_AGE,
  type CorrectionFrequency,
  type CorrectionRow,
} from './age-correction-tables';

export type AgeCorrection =
  | {
      ok: true;
      values: Record<StsFrequency, number>;
      baselineRow: Record<StsFrequency, number>;
      recentRow: Record<StsFrequency, number>;
      table: 'F-1' | 'F-2';
    }
  | { ok: false; reason: string };

export function tableRow(sex: 'F' | 'M', age: number): CorrectionRow {
  const clamped = Math.min(TABLE_MAX_AGE, Math.max(TABLE_MIN_AGE, Math.floor(age)));
  const table = sex === 'M' ? TABLE_F1_MALES : TABLE_F2_FEMALES;
  return table[clamped - TABLE_MIN_AGE]!;
}

export function tableValue(sex: 'F' | 'M', age: number, frequency: CorrectionFrequency): number | null {
  return tableRow(sex, age)[CORRECTION_FREQUENCIES.indexOf(frequency)] ?? null;
}

export function ageCorrection234(sex: string | null | undefined, baselineAge: number | null | undefined, recentAge: number | null | undefined): AgeCorrection {
  if (sex !== 'F' && sex !== 'M') return { ok: false, reason: 'Appendix F has tables for males and females only; sex not recorded as F or M' };
  if (baselineAge == null || recentAge == null || !Number.isFinite(baselineAge) || !Number.isFinite(recentAge)) {
    return { ok: false, reason: 'age unknown (no birth year)' };
  }
  const table = sex === 'M' ? 'F-1' : 'F-2';
  const values = {} as Record<StsFrequency, number>;
  const baselineRow = {} as Record<StsFrequency, number>;
  const recentRow = {} as Record<StsFrequency, number>;
  for (const f of STS_FREQUENCIES) {
    const atBaseline = tableValue(sex, baselineAge, f);
    const atRecent = tableValue(sex, recentAge, f);
    if (atBaseline == null || atRecent == null) {
      return { ok: false, reason: `Table ${table} value missing from the stored reference (ages ${Math.floor(baselineAge)} and ${Math.floor(recentAge)})` };
    }
    baselineRow[f] = atBaseline;
    recentRow[f] = atRecent;
    values[f] = atRecent - atBaseline;
  }
  return { ok: true, values, baselineRow, recentRow, table };
}

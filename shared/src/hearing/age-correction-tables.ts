/**
 * Age correction values of 29 CFR 1910.95 Appendix F (non-mandatory), Tables F-1 (males) and F-2
 * (females), in dB at 1000, 2000, 3000, 4000 and 6000 Hz, for ages "20 or younger" to "60 or older".
 * The appendix states the tables were developed by NIOSH ("Criteria for a Recommended Standard:
 * Occupational Exposure to Noise"); the same tables are printed in 49 CFR 227 Appendix F.
 *
 * Source of the values below, read (not recalled) from a web copy of Table F-1:
 *   http://khosro.goorabi.ir/ (page "TABLE F-1 – AGE CORRECTION VALUES IN DECIBELS FOR MALES",
 *   reproducing 29 CFR 1910.95 Appendix F; the official text is at
 *   https://www.osha.gov/laws-regs/regulations/standardnumber/1910/1910.95AppF and
 *   https://www.ecfr.gov/current/title-29/part-1910/section-1910.95#Appendix-F-to-§1910.95).
 *
 * MISSING, not invented: the stored reference showed Table F-1 only for ages ≤20 to 31 in full and
 * age 32 at 1000–4000 Hz (its 6000 Hz value was cut off); Table F-1 ages 33 to ≥60 and the whole of
 * Table F-2 (females) could not be read from any stored source. Each missing value is `null`, and
 * an age correction that needs one is reported as unavailable (the shift is then computed without
 * it, which can only flag more shifts, never fewer). Fill the rows from the official text above.
 */
import type { StsFrequency } from './audiogram';

export type CorrectionFrequency = 1000 | StsFrequency | 6000;
export const CORRECTION_FREQUENCIES: readonly CorrectionFrequency[] = [1000, 2000, 3000, 4000, 6000];

/** One row: values at 1000, 2000, 3000, 4000, 6000 Hz; `null` where the source could not be read. */
export type CorrectionRow = readonly [number | null, number | null, number | null, number | null, number | null];

/** The tables' first and last rows: "20 or younger" and "60 or older". */
export const TABLE_MIN_AGE = 20;
export const TABLE_MAX_AGE = 60;

const MISSING: CorrectionRow = [null, null, null, null, null];

function rowsFrom(known: Record<number, CorrectionRow>): readonly CorrectionRow[] {
  const rows: CorrectionRow[] = [];
  for (let age = TABLE_MIN_AGE; age <= TABLE_MAX_AGE; age += 1) rows.push(known[age] ?? MISSING);
  return rows;
}

/** Table F-1, age correction values in decibels for males (index 0 = "20 or younger"). */
export const TABLE_F1_MALES: readonly CorrectionRow[] = rowsFrom({
  20: [5, 3, 4, 5, 8],
  21: [5, 3, 4, 5, 8],
  22: [5, 3, 4, 5, 8],
  23: [5, 3, 4, 6, 9],
  24: [5, 3, 5, 6, 9],
  25: [5, 3, 5, 7, 10],
  26: [5, 4, 5, 7, 10],
  27: [5, 4, 6, 7, 11],
  28: [6, 4, 6, 8, 11],
  29: [6, 4, 6, 8, 12],
  30: [6, 4, 6, 9, 12],
  31: [6, 4, 7, 9, 13],
  // 6000 Hz value cut off in the stored source.
  32: [6, 5, 7, 10, null],
  // 33 to "60 or older": not found in a stored source.
});

/** Table F-2, age correction values in decibels for females: not found in a stored source (all rows missing). */
export const TABLE_F2_FEMALES: readonly CorrectionRow[] = rowsFrom({});

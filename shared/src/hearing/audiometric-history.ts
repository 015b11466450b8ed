/**
 * Reads one ear's audiograms over time into the shifts they show, with every step kept so that the
 * physician sees how each result was reached:
 * - Retest (1910.95(g)(7)(ii)): a retest within 30 days after an annual audiogram is considered as
 *   that annual audiogram; a retest with no annual in the 30 days before it is not used.
 * - Baseline (g)(5): the first baseline test; a later test of type baseline sets a new one.
 * - Shift (g)(10): each annual audiogram against the baseline in use, age-corrected when the
 *   setting asks for it and Appendix F gives the values (otherwise uncorrected, with the reason).
 * - Revision (g)(9): (i) a shift seen again on the next annual audiogram is persistent, and that
 *   audiogram becomes the baseline (the shift is counted once, at the first); (ii) an annual
 *   audiogram markedly better than the baseline (see `isImprovement`) becomes the baseline.
 */
import { STS_FREQUENCIES, type Ear, type EarAudiogram, type StsFrequency } from './audiogram';
import { ageCorrection234 } from './age-correction';
import { isImprovement, standardThresholdShift, type ShiftComputation } from './standard-threshold-shift';

export const RETEST_WINDOW_DAYS = 30;

export interface HearingSettings {
  /** Appendix F age correction; on by default as 1910.95(g)(10)(ii) allows. */
  ageCorrection: boolean;
}
export const DEFAULT_HEARING_SETTINGS: HearingSettings = { ageCorrection: true };

export interface Person {
  sex: string | null;
  birthYear: number | null;
}

export type HistoryStep =
  | { kind: 'baseline'; audiogramId: string; testDate: string; reason: 'first baseline' | 'baseline test' }
  | { kind: 'retest-replaces'; audiogramId: string; replacedId: string; testDate: string }
  | { kind: 'retest-unused'; audiogramId: string; testDate: string }
  | { kind: 'no-baseline'; audiogramId: string; testDate: string }
  | {
      kind: 'compared';
      audiogramId: string;
      testDate: string;
      baselineId: string;
      baselineDate: string;
      computation: ShiftComputation;
      ageCorrection: { applied: true; table: 'F-1' | 'F-2'; baselineAge: number; recentAge: number } | { applied: false; reason: string };
      /** A new shift (to become a suspected case), a persistent one (baseline revised), or none. */
      outcome: 'shift' | 'persistent-shift' | 'no-shift' | 'improvement';
    }
  | { kind: 'baseline-revised'; audiogramId: string; testDate: string; reason: 'persistent shift' | 'improvement' };

export interface ShiftFinding {
  ear: Ear;
  audiogramId: string;
  testDate: string;
  baselineId: string;
  computation: ShiftComputation;
}

export interface EarHistory {
  ear: Ear;
  steps: HistoryStep[];
  shifts: ShiftFinding[];
  /** The baseline in use after the last test. */
  baselineId: string | null;
}

function pick234(a: EarAudiogram): Record<StsFrequency, number> {
  const out = {} as Record<StsFrequency, number>;
  for (const f of STS_FREQUENCIES) out[f] = a.thresholds[f];
  return out;
}

function daysBetween(from: string, to: string): number {
  return Math.round((Date.parse(`${to}T00:00:00Z`) - Date.parse(`${from}T00:00:00Z`)) / 86_400_000);
}

function ageAt(person: Person, date: string): number | null {
  return person.birthYear == null ? null : Number(date.slice(0, 4)) - person.birthYear;
}

function byDate(a: EarAudiogram, b: EarAudiogram): number {
  return a.testDate < b.testDate ? -1 : a.testDate > b.testDate ? 1 : a.id < b.id ? -1 : a.id > b.id ? 1 : 0;
}

/** Annual tests with their retests applied, in date order; retests and baselines tagged. */
function effectiveTests(tests: EarAudiogram[], steps: HistoryStep[]): EarAudiogram[] {
  const sorted = [...tests].sort(byDate);
  const out: EarAudiogram[] = [];
  for (const t of sorted) {
    if (t.testType !== 'retest') {
      out.push(t);
      continue;
    }
    // The latest annual within the 30 days before this retest.
    let target = -1;
    for (let i = out.length - 1; i >= 0; i -= 1) {
      const d = daysBetween(out[i]!.testDate, t.testDate);
      if (d > RETEST_WINDOW_DAYS) break;
      if (out[i]!.testType === 'annual' && d >= 0) {
        target = i;
        break;
      }
    }
    if (target < 0) {
      steps.push({ kind: 'retest-unused', audiogramId: t.id, testDate: t.testDate });
      continue;
    }
    steps.push({ kind: 'retest-replaces', audiogramId: t.id, replacedId: out[target]!.id, testDate: t.testDate });
    // The retest stands for the annual test: its thresholds, its id and date, the annual's role.
    out[target] = { ...t, testType: 'annual' };
  }
  return out;
}

export function earHistory(ear: Ear, tests: EarAudiogram[], person: Person, settings: HearingSettings = DEFAULT_HEARING_SETTINGS): EarHistory {
  const steps: HistoryStep[] = [];
  const shifts: ShiftFinding[] = [];
  let baseline: EarAudiogram | null = null;
  let pendingShift = false;
  for (const t of effectiveTests(
    tests.filter((x) => x.ear === ear),
    steps,
  )) {
    if (t.testType === 'baseline' || baseline == null) {
      if (t.testType !== 'baseline') {
        steps.push({ kind: 'no-baseline', audiogramId: t.id, testDate: t.testDate });
        continue;
      }
      steps.push({ kind: 'baseline', audiogramId: t.id, testDate: t.testDate, reason: baseline == null ? 'first baseline' : 'baseline test' });
      baseline = t;
      pendingShift = false;
      continue;
    }
    const baselineAge = ageAt(person, baseline.testDate);
    const recentAge = ageAt(person, t.testDate);
    const correction = settings.ageCorrection
      ? ageCorrection234(person.sex, baselineAge, recentAge)
      : ({ ok: false, reason: 'age correction off in the settings' } as const);
    const computation = standardThresholdShift(pick234(baseline), pick234(t), correction.ok ? correction.values : undefined);
    const outcome: 'shift' | 'persistent-shift' | 'no-shift' | 'improvement' = computation.shift
      ? pendingShift
        ? 'persistent-shift'
        : 'shift'
      : isImprovement(pick234(baseline), pick234(t))
        ? 'improvement'
        : 'no-shift';
    steps.push({
      kind: 'compared',
      audiogramId: t.id,
      testDate: t.testDate,
      baselineId: baseline.id,
      baselineDate: baseline.testDate,
      computation,
      ageCorrection: correction.ok
        ? { applied: true, table: correction.table, baselineAge: baselineAge!, recentAge: recentAge! }
        : { applied: false, reason: correction.reason },
      outcome,
    });
    if (outcome === 'shift') {
      shifts.push({ ear, audiogramId: t.id, testDate: t.testDate, baselineId: baseline.id, computation });
      pendingShift = true;
    } else if (outcome === 'persistent-shift' || outcome === 'improvement') {
      steps.push({ kind: 'baseline-revised', audiogramId: t.id, testDate: t.testDate, reason: outcome === 'improvement' ? 'improvement' : 'persistent shift' });
      baseline = t;
      pendingShift = false;
    } else {
      pendingShift = false;
    }
  }
  return { ear, steps, shifts, baselineId: baseline?.id ?? null };
}

/** Both ears of one worker. */
export function workerHearingHistory(tests: EarAudiogram[], person: Person, settings: HearingSettings = DEFAULT_HEARING_SETTINGS): EarHistory[] {
  return (['left', 'right'] as const).map((ear) => earHistory(ear, tests, person, settings));
}

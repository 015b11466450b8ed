import type { IntakeDetail, IntakeDiff } from '@ratewarden/shared/intake-schemas';
import type { Principal } from '@ratewarden/shared/permissions';
import { isSmallCount, nestedSuppression } from '@ratewarden/shared/small-cells';
import { seesEveryCount } from '../../disclosure/run-frame';

type CaseDiff = Extract<IntakeDiff, { kind: 'cases' }>;
type RosterDiff = Extract<IntakeDiff, { kind: 'roster' }>;

/**
 * A case-list diff for a reader without `cases:read`: new and changed cases per outcome and per
 * outcome × status × exposure group, with counts from 1 to threshold − 1 withheld and the counts
 * that would give them back (nestedSuppression: outcomes under the file's totals, the split under
 * each outcome). The file's own totals stay: its uploader knows them.
 */
function caseDiffAsSeen(d: CaseDiff, threshold: number): CaseDiff {
  const split = d.split ?? [];
  const cellsOf = (code: string) => split.filter((c) => c.outcomeCode === code);
  // Without a stored split (older diffs), each outcome is its own single part.
  const groups = (k: 'new' | 'changed') => d.byOutcome.map((o) => (d.split ? cellsOf(o.outcomeCode).map((c) => c[k].count ?? 0) : [o[k] ?? 0]));
  const news = nestedSuppression(groups('new'), threshold);
  const changes = nestedSuppression(groups('changed'), threshold);
  return {
    ...d,
    byOutcome: d.byOutcome.map((o, i) => ({
      outcomeCode: o.outcomeCode,
      new: news.totals[i] ? null : o.new,
      changed: changes.totals[i] ? null : o.changed,
      newWithheld: news.totals[i] ?? null,
      changedWithheld: changes.totals[i] ?? null,
    })),
    ...(d.split && {
      split: d.byOutcome.flatMap((o, i) =>
        cellsOf(o.outcomeCode).map((c, j) => ({
          ...c,
          new: news.parts[i]![j] ? { count: null, withheld: news.parts[i]![j]! } : c.new,
          changed: changes.parts[i]![j] ? { count: null, withheld: changes.parts[i]![j]! } : c.changed,
        })),
      ),
    }),
  };
}

/** A roster diff for a reader without `cases:read`: the orphaned cases' count only, withheld when small. */
function rosterDiffAsSeen(d: RosterDiff, threshold: number): RosterDiff {
  if (!d.orphanedCases) return d;
  const n = d.orphanedCases.count ?? 0;
  const small = isSmallCount(n, threshold);
  return { ...d, orphanedCases: { count: small ? null : n, withheld: small ? 'small' : null } };
}

/**
 * An intake as its reader may see it. The stored diff holds every count and, for a roster, the
 * stored cases it would orphan; only a holder of `cases:read` (the physician) gets those cases
 * and the small counts. Worker keys are pseudonymous and the hygienist's own upload: they stay.
 */
export function intakeAsSeenBy(intake: IntakeDetail, principal: Principal, threshold: number): IntakeDetail {
  if (!intake.diff || seesEveryCount(principal)) return intake;
  const diff = intake.diff.kind === 'cases' ? caseDiffAsSeen(intake.diff, threshold) : rosterDiffAsSeen(intake.diff, threshold);
  return { ...intake, diff };
}

/** Whether the intake as shown names stored cases (a read to audit as case-level). */
export function namesCases(intake: IntakeDetail): boolean {
  return intake.diff?.kind === 'roster' && (intake.diff.orphanedCases?.cases?.length ?? 0) > 0;
}

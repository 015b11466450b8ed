import type { PoolClient } from 'pg';
import { refreshPlannerStatistics } from '@ratewarden/db/planner-statistics';
import type { IntakeKind } from '@ratewarden/shared/intake';
import type { CellBounds } from '@ratewarden/shared/intake-cell';
import type { IntakeDiff, IntakeProblem } from '@ratewarden/shared/intake-schemas';
import { applyCases, caseDiff, caseScope, checkCases } from './case-intake';
import { collectProblems, openProblemTable } from './problems';
import { applyRoster, rosterDiff, rosterScope } from './roster-apply';
import { checkRoster } from './roster-checks';
import { rosterStage, type RosterStaged } from './roster-stage';
import { stagingRef } from './copy-stage';

export interface CheckOutcome {
  problems: IntakeProblem[];
  problemCount: number;
  diff: IntakeDiff | null;
  scope: { siteIds: number[]; monthFrom: string | null; monthTo: string | null };
}

/** One lock serializes every check-and-apply, so two intakes never judge the store at once. */
export async function lockIntakes(client: PoolClient): Promise<void> {
  await client.query(`SELECT pg_advisory_xact_lock(hashtext('ratewarden.intake.apply'))`);
  // Hash aggregates over a million staged rows stay in memory instead of spilling to disk.
  await client.query(`SET LOCAL work_mem = '256MB'`);
  // JIT compiling these one-off statements costs more than it saves at a million rows.
  await client.query(`SET LOCAL jit = off`);
}

/**
 * Runs every check of the kind over the intake's staging `table`; computes the diff only for a
 * file without problems. `bounds` says up to which month rows are taken in (the case cells are
 * judged here; a roster's were judged while streaming). For a roster, `staged` carries what the upload stream found; at apply it
 * is null and only the checks against the store run again (see checkRoster).
 */
export async function runChecks(
  client: PoolClient,
  kind: IntakeKind,
  table: string,
  bounds: CellBounds,
  staged: RosterStaged | null = null,
): Promise<CheckOutcome> {
  await openProblemTable(client);
  const st = rosterStage(table);
  // A case list often follows a large roster at once: its checks join the roster tables, whose
  // statistics autovacuum has not refreshed yet (a 125 s plan instead of 3 s on the benchmark).
  if (kind === 'cases') await refreshPlannerStatistics(async (sql, params) => (await client.query(sql, params)).rows);
  const unlisted = kind === 'roster' ? await checkRoster(client, st, staged) : (await checkCases(client, stagingRef(table), bounds), 0);
  const { problems, count } = await collectProblems(client);
  const problemCount = count + unlisted;
  const scope = kind === 'roster' ? await rosterScope(client, st) : await caseScope(client);
  if (problemCount > 0) return { problems, problemCount, diff: null, scope };
  const diff = kind === 'roster' ? await rosterDiff(client, st) : await caseDiff(client);
  return { problems, problemCount: 0, diff, scope };
}

/** Stores a checked intake (the scratch tables of `runChecks` in this transaction). */
export async function applyChecked(client: PoolClient, kind: IntakeKind, table: string, intakeId: string): Promise<{ superseded: string[] }> {
  return kind === 'roster' ? applyRoster(client, rosterStage(table), intakeId) : applyCases(client, intakeId);
}

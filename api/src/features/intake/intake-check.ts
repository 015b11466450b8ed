import type { PoolClient } from 'pg';
import type { IntakeKind } from '@ratewarden/shared/intake';
import type { IntakeDiff, IntakeProblem } from '@ratewarden/shared/intake-schemas';
import { applyCases, caseDiff, caseScope, checkCases } from './case-intake';
import { collectProblems, openProblemTable } from './problems';
import { applyRoster, rosterDiff, rosterScope } from './roster-apply';
import { checkRoster } from './roster-checks';

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
}

/** Runs every check of the kind; computes the diff only for a file without problems. */
export async function runChecks(client: PoolClient, kind: IntakeKind, stg: string): Promise<CheckOutcome> {
  await openProblemTable(client);
  if (kind === 'roster') await checkRoster(client, stg);
  else await checkCases(client, stg);
  const { problems, count } = await collectProblems(client);
  const scope = kind === 'roster' ? await rosterScope(client) : await caseScope(client);
  if (count > 0) return { problems, problemCount: count, diff: null, scope };
  const diff = kind === 'roster' ? await rosterDiff(client, stg) : await caseDiff(client);
  return { problems, problemCount: 0, diff, scope };
}

/** Stores a checked intake (the scratch tables of `runChecks` in this transaction). */
export async function applyChecked(client: PoolClient, kind: IntakeKind, stg: string, intakeId: string): Promise<{ superseded: string[] }> {
  return kind === 'roster' ? applyRoster(client, stg, intakeId) : applyCases(client, intakeId);
}

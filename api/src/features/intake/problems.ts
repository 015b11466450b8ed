import type { PoolClient } from 'pg';
import type { IntakeProblem } from '@ratewarden/shared/intake-schemas';

/** Problems listed in the intake; all of them are counted. */
export const PROBLEMS_LISTED = 1000;

/** A scratch table for one check pass, gone at the end of the transaction. */
export async function openProblemTable(client: PoolClient): Promise<void> {
  await client.query(`DROP TABLE IF EXISTS pg_temp.intake_problems`);
  await client.query(`CREATE TEMP TABLE intake_problems (line bigint, col text, val text, reason text NOT NULL) ON COMMIT DROP`);
}

export async function addProblems(client: PoolClient, problems: IntakeProblem[]): Promise<void> {
  if (!problems.length) return;
  await client.query(`INSERT INTO intake_problems (line, col, val, reason) SELECT * FROM unnest($1::bigint[], $2::text[], $3::text[], $4::text[])`, [
    problems.map((p) => p.line),
    problems.map((p) => p.column),
    problems.map((p) => p.value),
    problems.map((p) => p.reason),
  ]);
}

export async function collectProblems(client: PoolClient): Promise<{ problems: IntakeProblem[]; count: number }> {
  const [{ n }] = (await client.query<{ n: string }>(`SELECT count(*) AS n FROM intake_problems`)).rows as [{ n: string }];
  const { rows } = await client.query<{ line: string | null; col: string | null; val: string | null; reason: string }>(
    `SELECT line, col, val, reason FROM intake_problems ORDER BY line NULLS FIRST, col, reason LIMIT ${PROBLEMS_LISTED}`,
  );
  return { count: Number(n), problems: rows.map((r) => ({ line: r.line === null ? null : Number(r.line), column: r.col, value: r.val, reason: r.reason })) };
}

import type { DataSource, EntityManager } from 'typeorm';
import type { Principal } from '@ratewarden/shared/permissions';
import type { IntakeDetail, IntakeListResponse, IntakeSummary } from '@ratewarden/shared/intake-schemas';
import { intakeListQuerySchema } from '@ratewarden/shared/intake-schemas';
import type { z } from 'zod';
import { assertSites, siteScope } from '../../auth/authorize';
import { AppError } from '../../lib/app-error';

type Db = DataSource | EntityManager | { query: (sql: string, params?: unknown[]) => Promise<unknown> };

interface IntakeRow {
  id: string;
  kind: 'roster' | 'cases';
  state: IntakeSummary['state'];
  file_name: string;
  checksum: string;
  size_bytes: string;
  site_ids: number[];
  month_from: string | null;
  month_to: string | null;
  row_count: number;
  problem_count: number;
  submitted_label: string | null;
  created_at: Date;
  checked_at: Date | null;
  applied_at: Date | null;
  superseded_at: Date | null;
  staging_table: string | null;
  problems?: IntakeDetail['problems'];
  diff?: IntakeDetail['diff'];
}

const columns = `i.id, i.kind, i.state, i.file_name, i.checksum, i.size_bytes, i.site_ids,
  to_char(i.month_from, 'YYYY-MM') AS month_from, to_char(i.month_to, 'YYYY-MM') AS month_to, i.row_count, i.problem_count,
  coalesce(u.email, 'client:' || i.submitted_by_client) AS submitted_label,
  i.created_at, i.checked_at, i.applied_at, i.superseded_at, i.staging_table`;

const iso = (d: Date | null) => (d ? new Date(d).toISOString() : null);

function summary(r: IntakeRow): IntakeSummary {
  return {
    id: r.id,
    kind: r.kind,
    state: r.state,
    fileName: r.file_name,
    checksum: r.checksum,
    sizeBytes: Number(r.size_bytes),
    siteIds: r.site_ids,
    monthFrom: r.month_from,
    monthTo: r.month_to,
    rowCount: r.row_count,
    problemCount: r.problem_count,
    submittedBy: r.submitted_label,
    createdAt: iso(r.created_at)!,
    checkedAt: iso(r.checked_at),
    appliedAt: iso(r.applied_at),
    supersededAt: iso(r.superseded_at),
    staged: r.staging_table !== null,
  };
}

/** The intake with its problems, diff and the run it requested; 404 when absent. */
export async function loadIntake(db: Db, id: string): Promise<IntakeDetail> {
  if (!/^[0-9a-f-]{36}$/i.test(id)) throw new AppError('not_found', 'no such intake');
  const rows = (await db.query(`SELECT ${columns}, i.problems, i.diff FROM intakes i LEFT JOIN users u ON u.id = i.submitted_by WHERE i.id = $1`, [
    id,
  ])) as IntakeRow[];
  const r = rows[0];
  if (!r) throw new AppError('not_found', 'no such intake');
  const runs = (await db.query(`SELECT id, requested_at, picked_at, reason FROM run_requests WHERE intake_id = $1 ORDER BY requested_at DESC LIMIT 1`, [
    id,
  ])) as Array<{ id: string; requested_at: Date; picked_at: Date | null; reason: string }>;
  const run = runs[0];
  // The run that consumed the request lists it among its inputs.
  const taken = run
    ? (
        (await db.query(`SELECT id, number, state, finished_at FROM runs WHERE inputs->'requestIds' ? $1 ORDER BY started_at DESC LIMIT 1`, [
          String(run.id),
        ])) as Array<{ id: string; number: string; state: 'running' | 'succeeded' | 'failed'; finished_at: Date | null }>
      )[0]
    : undefined;
  const conflicts =
    r.kind === 'cases'
      ? (
          (await db.query(`SELECT EXISTS (SELECT 1 FROM intake_case_conflicts WHERE intake_id = $1 AND resolution IS NULL) AS pending`, [id])) as Array<{
            pending: boolean;
          }>
        )[0]!.pending
      : undefined;
  return {
    ...summary(r),
    ...(conflicts === undefined ? {} : { conflictsPending: conflicts }),
    problems: r.problems ?? [],
    diff: r.diff ?? null,
    runRequest: run
      ? {
          id: Number(run.id),
          requestedAt: iso(run.requested_at)!,
          pickedAt: iso(run.picked_at),
          reason: run.reason,
          run: taken ? { id: taken.id, number: Number(taken.number), state: taken.state, finishedAt: iso(taken.finished_at) } : null,
        }
      : null,
  };
}

/** For people: only intakes whose sites they may all see, and their own site-less rejects. */
function scopeFilter(p: Principal, params: unknown[]): string {
  const scope = siteScope(p);
  if (scope === 'all') return 'true';
  params.push(scope);
  const s = `$${params.length}`;
  params.push(p.kind === 'user' ? p.id : null);
  return `(i.site_ids <@ ${s}::int[] AND (cardinality(i.site_ids) > 0 OR i.submitted_by = $${params.length}))`;
}

export async function listIntakes(ds: DataSource, p: Principal, q: z.infer<typeof intakeListQuerySchema>): Promise<IntakeListResponse> {
  const params: unknown[] = [];
  const where = [scopeFilter(p, params)];
  if (q.kind) {
    params.push(q.kind);
    where.push(`i.kind = $${params.length}`);
  }
  if (q.state) {
    params.push(q.state);
    where.push(`i.state = $${params.length}`);
  }
  const [{ n }] = (await ds.query(`SELECT count(*) AS n FROM intakes i WHERE ${where.join(' AND ')}`, params)) as [{ n: string }];
  const rows = (await ds.query(
    `SELECT ${columns} FROM intakes i LEFT JOIN users u ON u.id = i.submitted_by WHERE ${where.join(' AND ')}
     ORDER BY i.created_at DESC LIMIT ${q.limit} OFFSET ${q.offset}`,
    params,
  )) as IntakeRow[];
  return { items: rows.map(summary), total: Number(n) };
}

export async function getIntake(ds: DataSource, p: Principal, id: string): Promise<IntakeDetail> {
  const intake = await loadIntake(ds, id);
  assertSites(p, intake.siteIds);
  return intake;
}

import { In, IsNull, type DataSource, type EntityManager } from 'typeorm';
import { IntakeEntity, type Intake } from '@ratewarden/db/entities/intake';
import { IntakeCaseConflictEntity } from '@ratewarden/db/entities/intake-case-conflict';
import { RunEntity } from '@ratewarden/db/entities/run';
import { RunRequestEntity } from '@ratewarden/db/entities/run-request';
import { UserEntity } from '@ratewarden/db/entities/user';
import type { Principal } from '@ratewarden/shared/permissions';
import type { IntakeDetail, IntakeListResponse, IntakeSummary } from '@ratewarden/shared/intake-schemas';
import { intakeListQuerySchema } from '@ratewarden/shared/intake-schemas';
import type { z } from 'zod';
import { assertSites, siteScope } from '../../auth/authorize';
import { AppError } from '../../lib/app-error';

type Db = DataSource | EntityManager;

/** The columns a summary shows (the list reads these only: problems and diff can be large). */
const SUMMARY_COLUMNS = [
  'id',
  'kind',
  'state',
  'fileName',
  'checksum',
  'sizeBytes',
  'siteIds',
  'monthFrom',
  'monthTo',
  'rowCount',
  'problemCount',
  'submittedBy',
  'submittedByClient',
  'createdAt',
  'checkedAt',
  'appliedAt',
  'supersededAt',
  'stagingTable',
] as const satisfies ReadonlyArray<keyof Intake>;

type SummaryColumns = Pick<Intake, (typeof SUMMARY_COLUMNS)[number]>;

const iso = (d: Date | null) => (d ? new Date(d).toISOString() : null);
/** A month column (a date, the first of its month) as YYYY-MM. */
const month = (d: string | null) => (d === null ? null : d.slice(0, 7));

/** Who submitted each intake: the user's email, else the integration client as `client:<id>`. */
async function submitterLabels(db: Db, intakes: SummaryColumns[]): Promise<Map<SummaryColumns, string | null>> {
  const userIds = [...new Set(intakes.flatMap((i) => (i.submittedBy ? [i.submittedBy] : [])))];
  const users = userIds.length ? await db.getRepository(UserEntity).find({ select: { id: true, email: true }, where: { id: In(userIds) } }) : [];
  const email = new Map(users.map((u) => [u.id, u.email]));
  return new Map(
    intakes.map((i) => [i, (i.submittedBy ? email.get(i.submittedBy) : undefined) ?? (i.submittedByClient === null ? null : `client:${i.submittedByClient}`)]),
  );
}

function summary(i: SummaryColumns, submittedBy: string | null): IntakeSummary {
  return {
    id: i.id,
    kind: i.kind,
    state: i.state,
    fileName: i.fileName,
    checksum: i.checksum,
    sizeBytes: Number(i.sizeBytes),
    siteIds: i.siteIds,
    monthFrom: month(i.monthFrom),
    monthTo: month(i.monthTo),
    rowCount: i.rowCount,
    problemCount: i.problemCount,
    submittedBy,
    createdAt: iso(i.createdAt)!,
    checkedAt: iso(i.checkedAt),
    appliedAt: iso(i.appliedAt),
    supersededAt: iso(i.supersededAt),
    staged: i.stagingTable !== null,
  };
}

/** The request for a run an intake made (its latest), with the run that took it up once one has. */
async function intakeRunRequest(db: Db, intakeId: string): Promise<IntakeDetail['runRequest']> {
  const request = await db.getRepository(RunRequestEntity).findOne({ where: { intakeId }, order: { requestedAt: 'DESC' } });
  if (!request) return null;
  // The run that consumed the request lists it among its inputs.
  const run = await db
    .getRepository(RunEntity)
    .createQueryBuilder('r')
    .select(['r.id', 'r.number', 'r.state', 'r.finishedAt'])
    .where(`r.inputs->'requestIds' ? :requestId`, { requestId: String(request.id) })
    .orderBy('r.startedAt', 'DESC')
    .limit(1)
    .getOne();
  return {
    id: Number(request.id),
    requestedAt: iso(request.requestedAt)!,
    pickedAt: iso(request.pickedAt),
    reason: request.reason,
    run: run ? { id: run.id, number: Number(run.number), state: run.state, finishedAt: iso(run.finishedAt) } : null,
  };
}

/** The intake with its problems, diff and the run it requested; 404 when absent. */
export async function loadIntake(db: Db, id: string): Promise<IntakeDetail> {
  if (!/^[0-9a-f-]{36}$/i.test(id)) throw new AppError('not_found', 'no such intake');
  const intake = await db.getRepository(IntakeEntity).findOneBy({ id });
  if (!intake) throw new AppError('not_found', 'no such intake');
  const submitter = (await submitterLabels(db, [intake])).get(intake) ?? null;
  const conflictsPending =
    intake.kind === 'cases' ? await db.getRepository(IntakeCaseConflictEntity).existsBy({ intakeId: id, resolution: IsNull() }) : undefined;
  return {
    ...summary(intake, submitter),
    ...(conflictsPending === undefined ? {} : { conflictsPending }),
    problems: intake.problems ?? [],
    diff: intake.diff ?? null,
    runRequest: await intakeRunRequest(db, id),
  };
}

/** The newest intakes first, filtered; for people, only intakes whose sites they may all see, and their own site-less rejects. */
export async function listIntakes(ds: DataSource, p: Principal, q: z.infer<typeof intakeListQuerySchema>): Promise<IntakeListResponse> {
  const qb = ds
    .getRepository(IntakeEntity)
    .createQueryBuilder('i')
    .select(SUMMARY_COLUMNS.map((c) => `i.${c}`));
  const scope = siteScope(p);
  if (scope !== 'all') {
    qb.where('i.siteIds <@ CAST(:scope AS int[]) AND (cardinality(i.siteIds) > 0 OR i.submittedBy = :self)', {
      scope,
      self: p.kind === 'user' ? p.id : null,
    });
  }
  if (q.kind) qb.andWhere('i.kind = :kind', { kind: q.kind });
  if (q.state) qb.andWhere('i.state = :state', { state: q.state });
  const [intakes, total] = await qb.orderBy('i.createdAt', 'DESC').limit(q.limit).offset(q.offset).getManyAndCount();
  const submitters = await submitterLabels(ds, intakes);
  return { items: intakes.map((i) => summary(i, submitters.get(i) ?? null)), total };
}

export async function getIntake(ds: DataSource, p: Principal, id: string): Promise<IntakeDetail> {
  const intake = await loadIntake(ds, id);
  assertSites(p, intake.siteIds);
  return intake;
}

import { IsNull, Like, type DataSource } from 'typeorm';
import { rows } from '@ratewarden/db';
import { CaseEventEntity } from '@ratewarden/db/entities/case-event';
import { WorkerEntity } from '@ratewarden/db/entities/worker';
import type { Principal } from '@ratewarden/shared/permissions';
import type { HearingSettings } from '@ratewarden/shared/hearing/audiometric-history';
import type { HearingWorkerListResponse, HearingWorkerResponse } from '@ratewarden/shared/hearing/hearing-view';
import { recordAudit } from '../../audit/audit-log';
import { siteScope } from '../../auth/authorize';
import { AppError } from '../../lib/app-error';
import { loadWorkerHearing } from './worker-hearing';

/**
 * Workers the reader may see (every worker for 'all'): with a current roster row at one of their
 * sites, or audiograms uploaded for one of their sites (the upload's sites are its workers' roster sites).
 * `param` is the reader's sites (integer[], null for every site) as the statement names it; the worker is `w`.
 */
const visibleWorker = (param: string) => `(${param}::integer[] IS NULL OR EXISTS (
  SELECT 1 FROM roster_entries re JOIN roster_slices rs ON rs.intake_id = re.intake_id AND rs.site_id = re.site_id AND rs.month = re.month
  WHERE re.worker_id = w.id AND re.site_id = ANY(${param}::integer[]))
  OR EXISTS (SELECT 1 FROM audiograms a JOIN intakes i ON i.id = a.intake_id WHERE a.worker_id = w.id AND i.site_ids && ${param}::integer[]))`;

const scopeParam = (p: Principal) => {
  const s = siteScope(p);
  return s === 'all' ? null : s;
};

/** The workers with audiograms, with how many shifts they show. Case-level: audited. */
export async function listHearingWorkers(
  ds: DataSource,
  principal: Principal,
  settings: HearingSettings,
  ip?: string | null,
): Promise<HearingWorkerListResponse> {
  const ids = (
    await rows<{ id: string }>(
      ds,
      `SELECT w.id::text FROM workers w WHERE EXISTS (SELECT 1 FROM audiograms a WHERE a.worker_id = w.id) AND ${visibleWorker('$1')} ORDER BY w.worker_key LIMIT 5000`,
      [scopeParam(principal)],
    )
  ).map((r) => r.id);
  const hearing = await loadWorkerHearing(ds, ids, settings);
  await recordAudit(ds, { actor: principal, action: 'cases.read', target: 'audiograms', ip });
  return {
    workers: hearing
      .map((h) => ({
        workerKey: h.workerKey,
        tests: new Set(h.audiograms.map((a) => `${a.testDate}|${a.testType}`)).size,
        lastTestDate: h.audiograms
          .map((a) => a.testDate)
          .sort()
          .at(-1)!,
        shifts: h.ears.reduce((n, e) => n + e.shifts.length, 0),
      }))
      .sort((a, b) => a.workerKey.localeCompare(b.workerKey)),
  };
}

/** One worker's audiograms, baselines and shifts with their computation. Case-level: audited. */
export async function getHearingWorker(
  ds: DataSource,
  principal: Principal,
  workerKey: string,
  settings: HearingSettings,
  ip?: string | null,
): Promise<HearingWorkerResponse> {
  const w = await ds
    .getRepository(WorkerEntity)
    .createQueryBuilder('w')
    .select(['w.id'])
    .where('w.workerKey = :workerKey', { workerKey })
    .andWhere(visibleWorker(':scope'), { scope: scopeParam(principal) })
    .getOne();
  const [h] = w ? await loadWorkerHearing(ds, [w.id], settings) : [];
  if (!w || !h) throw new AppError('not_found', 'no audiograms for that worker');
  // The worker's current standard-threshold-shift cases (worker-hearing.ts shiftCaseRef names them STS-…).
  const shifts = await ds.getRepository(CaseEventEntity).find({
    select: { caseRef: true, onsetDate: true, status: true },
    where: { workerId: w.id, supersededBy: IsNull(), caseRef: Like('STS-%') },
    order: { onsetDate: 'ASC' },
  });
  const cases: HearingWorkerResponse['cases'] = shifts.map((c) => ({ caseRef: c.caseRef, onsetDate: c.onsetDate, status: c.status }));
  await recordAudit(ds, { actor: principal, action: 'cases.read', target: `audiograms:worker:${w.id}`, ip });
  return {
    workerKey: h.workerKey,
    sex: h.sex,
    birthYear: h.birthYear,
    settings: { ageCorrection: settings.ageCorrection },
    audiograms: h.audiograms.map((a) => ({ id: a.id, testDate: a.testDate, ear: a.ear, testType: a.testType, thresholds: a.thresholds })),
    ears: h.ears,
    cases,
  };
}

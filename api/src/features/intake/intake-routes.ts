import { Router, type Request } from 'express';
import type { DataSource } from 'typeorm';
import { intakeKindSchema } from '@ratewarden/shared/intake';
import { intakeColumns, templateCsv } from '@ratewarden/shared/intake-columns';
import { intakeListQuerySchema, intakeUploadQuerySchema, type IntakeDetail } from '@ratewarden/shared/intake-schemas';
import { DEFAULT_SMALL_CELL_THRESHOLD } from '@ratewarden/shared/small-cells';
import { recordAudit } from '../../audit/audit-log';
import { authorize } from '../../auth/authorize';
import { AppError } from '../../lib/app-error';
import { tooLarge } from '../../lib/byte-meter';
import { intakeAsSeenBy, namesCases } from './intake-disclosure';
import { getIntake, listIntakes } from './intake-queries';
import { DEFAULT_MAX_BYTES, receiveIntake } from './intake-receive';
import { applyIntake, discardIntake, restoreIntake } from './intake-service';
import { DEFAULT_EXPIRY_HOURS, sweepStaging } from './intake-expiry';
import { firstFile } from '../../lib/multipart-file';

export interface IntakeRouterDeps {
  dataSource: DataSource;
  /** Largest file accepted, in bytes (default 512 MiB). */
  maxBytes?: number;
  /** Take in months after the current one (INTAKE_ALLOW_FUTURE_MONTHS). */
  allowFutureMonths?: boolean;
  /** Hours a checked intake waits for apply before it expires (INTAKE_EXPIRY_HOURS). */
  expiryHours?: number;
  /** Counts of cases below this are withheld in diffs for everyone but the physician (SMALL_CELL_THRESHOLD). */
  smallCellThreshold?: number;
}

/**
 * Roster and case-list intakes: upload (check or check-and-apply), history, apply, discard, restore.
 * Uploads, the history and apply first sweep expired checked intakes away (intake-expiry.ts).
 */
export function intakeRouter({
  dataSource: ds,
  maxBytes = DEFAULT_MAX_BYTES,
  allowFutureMonths = false,
  expiryHours = DEFAULT_EXPIRY_HOURS,
  smallCellThreshold = DEFAULT_SMALL_CELL_THRESHOLD,
}: IntakeRouterDeps): Router {
  const router = Router();
  const sweep = () => sweepStaging(ds, expiryHours);
  // Every intake answered goes through this: diffs hold case counts and, for rosters, case references.
  const seen = (req: Request, intake: IntakeDetail) => intakeAsSeenBy(intake, req.principal!, smallCellThreshold);

  router.get('/templates/:file', authorize('intake:formats'), (req, res) => {
    const kind = intakeKindSchema.safeParse(String(req.params.file).replace(/\.csv$/, ''));
    if (!kind.success) throw new AppError('not_found', 'templates are roster.csv and cases.csv');
    res.type('text/csv; charset=utf-8').attachment(`ratewarden-${kind.data}-template.csv`).send(templateCsv(kind.data));
  });

  router.get('/formats', authorize('intake:formats'), (_req, res) => {
    res.json(intakeColumns);
  });

  router.post('/', authorize('intake:write'), async (req, res) => {
    const q = intakeUploadQuerySchema.parse(req.query);
    // Refuse an announced oversize body before reading it, and close the connection after answering.
    if (Number(req.get('content-length') ?? 0) > maxBytes + 1024 * 1024) {
      res.set('connection', 'close');
      req.resume();
      throw tooLarge(maxBytes);
    }
    await sweep();
    const file = await firstFile(req, maxBytes).catch((err: unknown) => {
      // The body is not what it should be: answer, and do not read the rest of it.
      res.set('connection', 'close');
      throw err;
    });
    try {
      if (q.reportsThrough && !allowFutureMonths && q.reportsThrough > new Date().toISOString().slice(0, 8) + '01') {
        throw new AppError('validation_failed', 'reportsThrough cannot be a month still to come');
      }
      const result = await receiveIntake(ds, {
        kind: q.kind,
        mode: q.mode,
        fileName: file.fileName,
        stream: file.stream,
        principal: req.principal!,
        maxBytes,
        ip: req.ip,
        allowFutureMonths,
        reportsThrough: q.reportsThrough ?? null,
      });
      if (result.intake.state === 'rejected') {
        const first = result.intake.problems[0]?.reason ?? 'the file has problems';
        const more = result.intake.problemCount > 1 ? ` (and ${result.intake.problemCount - 1} more problems)` : '';
        throw new AppError('validation_failed', `the file was rejected: ${first}${more}`, result);
      }
      res.status(result.duplicate ? 200 : 201).json({ ...result, intake: seen(req, result.intake) });
    } catch (err) {
      // Whatever is left of the upload is read and dropped, so the answer reaches the client.
      res.set('connection', 'close');
      file.stream.resume();
      throw err;
    }
  });

  router.get('/', authorize('intake:read'), async (req, res) => {
    await sweep();
    res.json(await listIntakes(ds, req.principal!, intakeListQuerySchema.parse(req.query)));
  });
  router.get('/:id', authorize('intake:read'), async (req, res) => {
    const intake = seen(req, await getIntake(ds, req.principal!, String(req.params.id)));
    // The physician's view names the stored cases a roster would orphan: a case-level read. No count in the entry (the administrator reads the log).
    if (namesCases(intake)) await recordAudit(ds, { actor: req.principal!, action: 'cases.read', target: `intake:${intake.id}`, ip: req.ip });
    res.json(intake);
  });
  router.post('/:id/apply', authorize('intake:write'), async (req, res) => {
    await sweep();
    const intake = await applyIntake(ds, req.principal!, String(req.params.id), req.ip, { expiryHours, allowFutureMonths });
    if (intake.state === 'rejected')
      throw new AppError('validation_failed', `the intake no longer passes its checks: ${intake.problems[0]?.reason ?? ''}`, { intake: seen(req, intake) });
    res.json(seen(req, intake));
  });
  router.post('/:id/discard', authorize('intake:write'), async (req, res) => {
    res.json(seen(req, await discardIntake(ds, req.principal!, String(req.params.id), req.ip)));
  });
  router.post('/:id/restore', authorize('intake:write'), async (req, res) => {
    res.json(seen(req, await restoreIntake(ds, req.principal!, String(req.params.id), req.ip)));
  });
  return router;
}

import { Router, type Request } from 'express';
import type { DataSource } from 'typeorm';
import { z } from 'zod';
import { flagCloseInputSchema, flagListQuerySchema, flagNoteInputSchema, flagReviewInputSchema } from '@ratewarden/shared/flags';
import { authorize } from '../../auth/authorize';
import { versionsOf } from '../../lib/data-versions';
import { TaggedAnswers } from '../../lib/tagged-answers';
import { addFlagNote, flagNotes } from './flag-notes';
import { flagsAsSeenBy } from './flag-suppression';
import { closeFlag, flagCases, flagScopeOf, getFlag, listFlags, startReview } from './flags-service';

export interface FlagsRouterDeps {
  dataSource: DataSource;
  /** Case counts below this are withheld for every role but the physician (SMALL_CELL_THRESHOLD). */
  smallCellThreshold: number;
  /** Bytes of flag lists kept ready to send (default 16 MiB). */
  answerCacheBytes?: number;
}

const flagId = z.string().uuid();

/** Flags, their review and closing, and (physician only) the cases behind one and its clinical notes; mounted at /api/flags. */
export function flagsRouter({ dataSource: ds, smallCellThreshold, answerCacheBytes = 16 * 1024 ** 2 }: FlagsRouterDeps): Router {
  const router = Router();
  const reader = (req: Request) => ({ principal: req.principal!, smallCellThreshold });
  // The list reads flags, rules, groups, sites and the current run's frame: kept per reader by the
  // current run and the flags counter, which every write of those raises (lib/data-versions.ts).
  const lists = new TaggedAnswers('flags', answerCacheBytes);
  // A person sees the flags of their sites, and the company's only with every site (FlagScope).
  router.get('/', authorize('flags:read'), async (req, res) => {
    const query = flagListQuerySchema.parse(req.query);
    const { run, flags } = await versionsOf(ds, req);
    await lists.send(req, res, [run, flags, smallCellThreshold], async () =>
      flagsAsSeenBy(ds, await listFlags(ds, query, await flagScopeOf(ds, req.principal!)), reader(req)),
    );
  });
  router.get('/:id', authorize('flags:read'), async (req, res) => {
    res.json((await flagsAsSeenBy(ds, [await getFlag(ds, flagId.parse(req.params.id), await flagScopeOf(ds, req.principal!))], reader(req)))[0]);
  });
  router.post('/:id/review', authorize('flags:review'), async (req, res) => {
    res.json(
      (
        await flagsAsSeenBy(
          ds,
          [await startReview(ds, req.principal!, flagId.parse(req.params.id), flagReviewInputSchema.parse(req.body ?? {}).comment, req.ip)],
          reader(req),
        )
      )[0],
    );
  });
  router.post('/:id/close', authorize('flags:review'), async (req, res) => {
    res.json(
      (
        await flagsAsSeenBy(ds, [await closeFlag(ds, req.principal!, flagId.parse(req.params.id), flagCloseInputSchema.parse(req.body), req.ip)], reader(req))
      )[0],
    );
  });
  router.get('/:id/cases', authorize('cases:read'), async (req, res) => {
    res.json(await flagCases(ds, req.principal!, flagId.parse(req.params.id), req.ip));
  });
  router.get('/:id/notes', authorize('cases:read'), async (req, res) => {
    res.json(await flagNotes(ds, req.principal!, flagId.parse(req.params.id), req.ip));
  });
  router.post('/:id/notes', authorize('cases:review'), async (req, res) => {
    res.status(201).json(await addFlagNote(ds, req.principal!, flagId.parse(req.params.id), flagNoteInputSchema.parse(req.body ?? {}).text, req.ip));
  });
  return router;
}

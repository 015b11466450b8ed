import { Router } from 'express';
import type { DataSource } from 'typeorm';
import { z } from 'zod';
import { noticeListQuerySchema } from '@ratewarden/shared/notices';
import { authorize } from '../../auth/authorize';
import { listNotices, markUnread, openNotice, unreadNotices } from './notices-service';

const noticeId = z.string().uuid();

/**
 * The notices inbox, mounted at /api/notices: each reader of flags reads the threshold notices
 * addressed to them, and only those.
 */
export function noticesRouter({ dataSource: ds }: { dataSource: DataSource }): Router {
  const router = Router();
  router.get('/', authorize('flags:read'), async (req, res) => {
    res.json(await listNotices(ds, req.principal!, noticeListQuerySchema.parse(req.query)));
  });
  router.get('/unread', authorize('flags:read'), async (req, res) => {
    res.json(await unreadNotices(ds, req.principal!));
  });
  // Opening a notice marks it read: a POST, so that a prefetch or a crawler never does.
  router.post('/:id/open', authorize('flags:read'), async (req, res) => {
    res.json(await openNotice(ds, req.principal!, noticeId.parse(req.params.id)));
  });
  router.post('/:id/unread', authorize('flags:read'), async (req, res) => {
    res.json(await markUnread(ds, req.principal!, noticeId.parse(req.params.id)));
  });
  return router;
}

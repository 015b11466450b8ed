import { Router } from 'express';
import type { DataSource } from 'typeorm';
import { z } from 'zod';
import type { ApiConfig } from '../../config';
import { authorize } from '../../auth/authorize';
import { AppError } from '../../lib/app-error';
import { getMailboxMessage, listMailbox } from './mailbox-service';

export interface MailboxRouterDeps {
  dataSource: DataSource;
  config: ApiConfig;
}

/**
 * The development mailbox page's data: what the local SMTP fake received. Absent in production,
 * where notices go to a real mail server.
 */
export function mailboxRouter({ dataSource: ds, config }: MailboxRouterDeps): Router {
  const router = Router();
  router.use((_req, _res, next) =>
    next(config.NODE_ENV === 'production' ? new AppError('not_found', 'the development mailbox is not available in production') : undefined),
  );
  router.get('/', authorize('mailbox:read'), async (_req, res) => {
    res.json(await listMailbox(ds));
  });
  router.get('/:id', authorize('mailbox:read'), async (req, res) => {
    res.json(await getMailboxMessage(ds, z.string().regex(/^\d+$/).parse(req.params.id)));
  });
  return router;
}

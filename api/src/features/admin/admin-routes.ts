import { Router } from 'express';
import type { DataSource } from 'typeorm';
import { auditQuerySchema, clientRegistrationSchema, userAccessUpdateSchema, userInviteSchema } from '@ratewarden/shared/admin';
import { authorize, userOf } from '../../auth/authorize';
import { inviteUser, listClients, listUsers, queryAudit, registerClient, revokeClient, updateUserAccess } from './admin-service';

/** People, integration clients and the audit log: the administrator's configuration work. */
export function adminRouter(ds: DataSource): Router {
  const router = Router();
  router.get('/users', authorize('users:manage'), async (_req, res) => {
    res.json(await listUsers(ds));
  });
  router.post('/users', authorize('users:manage'), async (req, res) => {
    res.status(201).json(await inviteUser(ds, userOf(req), userInviteSchema.parse(req.body), req.ip));
  });
  router.patch('/users/:id', authorize('users:manage'), async (req, res) => {
    res.json(await updateUserAccess(ds, userOf(req), String(req.params.id), userAccessUpdateSchema.parse(req.body), req.ip));
  });
  router.get('/clients', authorize('clients:manage'), async (_req, res) => {
    res.json(await listClients(ds));
  });
  router.post('/clients', authorize('clients:manage'), async (req, res) => {
    res.status(201).json(await registerClient(ds, userOf(req), clientRegistrationSchema.parse(req.body), req.ip));
  });
  router.post('/clients/:clientId/revoke', authorize('clients:manage'), async (req, res) => {
    res.json(await revokeClient(ds, userOf(req), String(req.params.clientId), req.ip));
  });
  router.get('/audit', authorize('audit:read'), async (req, res) => {
    res.json(await queryAudit(ds, auditQuerySchema.parse(req.query)));
  });
  return router;
}

import { Router } from 'express';
import type { DataSource } from 'typeorm';
import { settingsUpdateSchema } from '@ratewarden/shared/settings';
import { authorize, userOf } from '../../auth/authorize';
import { analysisSettings, changeAnalysisSettings } from './settings-service';

export interface SettingsRouterDeps {
  dataSource: DataSource;
}

/** The analysis settings, mounted at /api/settings: every version (read), the next one (write). */
export function settingsRouter({ dataSource: ds }: SettingsRouterDeps): Router {
  const router = Router();
  router.get('/', authorize('settings:read'), async (_req, res) => {
    res.json(await analysisSettings(ds));
  });
  router.put('/', authorize('settings:write'), async (req, res) => {
    res.json(await changeAnalysisSettings(ds, userOf(req), settingsUpdateSchema.parse(req.body), req.ip));
  });
  return router;
}

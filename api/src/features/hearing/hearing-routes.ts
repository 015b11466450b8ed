import { Router } from 'express';
import type { DataSource } from 'typeorm';
import { AUDIOGRAM_TEMPLATE_CSV } from '@ratewarden/shared/hearing/audiogram-rows';
import type { HearingSettings } from '@ratewarden/shared/hearing/audiometric-history';
import { authorize } from '../../auth/authorize';
import { AppError } from '../../lib/app-error';
import { firstFile } from '../../lib/multipart-file';
import { AUDIOGRAM_MAX_BYTES, readAll } from './audiogram-file';
import { receiveAudiograms } from './audiogram-intake';
import { getHearingWorker, listHearingWorkers } from './hearing-queries';

export interface HearingRouterDeps {
  dataSource: DataSource;
  settings: HearingSettings & { outcomeCode: string };
}

/**
 * Audiograms, mounted at /api/audiograms: the hygienist uploads (intake:write); the physician alone
 * reads them, with the shifts derived and their computation (cases:read, every read audited).
 */
export function hearingRouter({ dataSource: ds, settings }: HearingRouterDeps): Router {
  const router = Router();
  router.get('/template.csv', authorize('intake:formats'), (_req, res) => {
    res.type('text/csv; charset=utf-8').attachment('ratewarden-audiograms-template.csv').send(AUDIOGRAM_TEMPLATE_CSV);
  });
  router.post('/', authorize('intake:write'), async (req, res) => {
    if (Number(req.get('content-length') ?? 0) > AUDIOGRAM_MAX_BYTES + 1024 * 1024) {
      res.set('connection', 'close');
      req.resume();
      throw new AppError('payload_too_large', `an audiogram file may be at most ${AUDIOGRAM_MAX_BYTES} bytes`);
    }
    const file = await firstFile(req, AUDIOGRAM_MAX_BYTES);
    let bytes: Buffer;
    try {
      bytes = await readAll(file.stream);
    } catch (err) {
      res.set('connection', 'close');
      file.stream.resume();
      throw err;
    }
    res.status(201).json(await receiveAudiograms(ds, { fileName: file.fileName, bytes, principal: req.principal!, ip: req.ip, settings }));
  });
  router.get('/workers', authorize('cases:read'), async (req, res) => {
    res.json(await listHearingWorkers(ds, req.principal!, settings, req.ip));
  });
  router.get('/workers/:workerKey', authorize('cases:read'), async (req, res) => {
    res.json(await getHearingWorker(ds, req.principal!, String(req.params.workerKey), settings, req.ip));
  });
  return router;
}

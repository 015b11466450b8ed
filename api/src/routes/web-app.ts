import { existsSync } from 'node:fs';
import { join } from 'node:path';
import express, { Router } from 'express';

/** Serves the built web app, with index.html for every client-side route. */
export function webAppRouter(distDir: string): Router {
  const router = Router();
  const index = join(distDir, 'index.html');
  // Hashed assets never change; index.html must always be revalidated.
  router.use('/assets', express.static(join(distDir, 'assets'), { immutable: true, maxAge: '1y', fallthrough: false }));
  router.use(express.static(distDir, { index: false }));
  router.get('/{*splat}', (_req, res) => {
    if (!existsSync(index)) {
      res.status(503).type('text/plain').send('The web app is not built yet: run `npm run build`.');
      return;
    }
    res.setHeader('Cache-Control', 'no-cache');
    res.sendFile(index);
  });
  return router;
}

import { join } from 'node:path';
import express, { type Express } from 'express';
import helmet from 'helmet';
import type { DataSource } from 'typeorm';
import type { ApiConfig } from './config';
import { errorHandler, notFound } from './middleware/error-handler';
import { healthRouter } from './routes/health';
import { webAppRouter } from './routes/web-app';

export interface AppDeps {
  dataSource: DataSource;
  config: ApiConfig;
}

/** Builds the Express app; `server.ts` listens, tests call it through supertest. */
export function createApp({ dataSource, config }: AppDeps): Express {
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', 'loopback');
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: { 'img-src': ["'self'", 'data:'], 'style-src': ["'self'", "'unsafe-inline'"] },
      },
    }),
  );
  app.use(express.json({ limit: '1mb' }));

  app.use('/api/health', healthRouter(dataSource));
  app.use('/api', notFound);
  app.use(webAppRouter(config.WEB_DIST ?? join(import.meta.dirname, '..', '..', 'web', 'dist')));
  app.use(errorHandler);
  return app;
}

import { join } from 'node:path';
import compression from 'compression';
import express, { type Express } from 'express';
import helmet from 'helmet';
import type { DataSource } from 'typeorm';
import { readDbConfig } from '@ratewarden/db';
import type { ApiConfig } from './config';
import { authRouter, sessionRouter } from './auth/auth-routes';
import { csrfProtection } from './auth/csrf';
import { principalMiddleware } from './auth/principal';
import { sessionMiddleware } from './auth/sessions';
import { adminRouter } from './features/admin/admin-routes';
import { casesRouter } from './features/cases/cases-routes';
import { groupsRouter } from './features/groups/groups-routes';
import { hearingRouter } from './features/hearing/hearing-routes';
import { intakeRouter } from './features/intake/intake-routes';
import { flagsRouter } from './features/flags/flags-routes';
import { mailboxRouter } from './features/mailbox/mailbox-routes';
import { noticesRouter } from './features/notices/notices-routes';
import { periodsRouter } from './features/periods/periods-routes';
import { rulesRouter } from './features/rules/rules-routes';
import { runsRouter } from './features/runs/runs-routes';
import { referenceRatesRouter } from './features/reference-rates/reference-rates-routes';
import { settingsRouter } from './features/settings/settings-routes';
import { sitesRouter } from './features/sites/sites-routes';
import { databaseSaturation } from './middleware/database-saturation';
import { errorHandler, notFound } from './middleware/error-handler';
import { intakeRateLimit } from './middleware/rate-limits';
import { healthRouter } from './routes/health';
import { webAppRouter } from './routes/web-app';

export interface AppDeps {
  dataSource: DataSource;
  config: ApiConfig;
  /** Requests allowed to wait for a database connection before 503 (DB_QUEUE_MAX). */
  dbQueueMax?: number;
}

/** Builds the Express app; `server.ts` listens, tests call it through supertest. */
export function createApp({ dataSource, config, dbQueueMax = readDbConfig().DB_QUEUE_MAX }: AppDeps): Express {
  const app = express();
  app.disable('x-powered-by');
  // Off unless configured: a client could otherwise pick its own address with X-Forwarded-For.
  app.set('trust proxy', config.TRUST_PROXY);
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          'img-src': ["'self'", 'data:'],
          'style-src': ["'self'", "'unsafe-inline'"],
          // Sign-out posts to /auth/logout, which redirects to the identity provider's end-session page.
          'form-action': ["'self'", new URL(config.OIDC_ISSUER).origin],
        },
      },
    }),
  );
  // JSON compresses about tenfold; small answers (under 1 KiB) go as they are.
  app.use(compression({ threshold: 1024 }));
  app.use(express.json({ limit: '1mb' }));
  app.use(express.urlencoded({ extended: false, limit: '16kb' }));

  app.use('/api/health', healthRouter(dataSource));
  app.use(['/api', '/auth'], databaseSaturation(dataSource, dbQueueMax), sessionMiddleware(dataSource, config), principalMiddleware(dataSource, config));
  app.use('/auth', authRouter(dataSource, config));
  app.use('/api', csrfProtection);
  app.use('/api/session', sessionRouter(config.SMALL_CELL_THRESHOLD));
  app.use('/api/admin', adminRouter(dataSource));
  app.use(
    '/api/intakes',
    intakeRateLimit(config.INTAKE_RATE_LIMIT),
    intakeRouter({
      dataSource,
      maxBytes: config.INTAKE_MAX_BYTES,
      allowFutureMonths: config.INTAKE_ALLOW_FUTURE_MONTHS,
      expiryHours: config.INTAKE_EXPIRY_HOURS,
      smallCellThreshold: config.SMALL_CELL_THRESHOLD,
    }),
  );
  app.use(
    '/api/audiograms',
    intakeRateLimit(config.INTAKE_RATE_LIMIT),
    hearingRouter({ dataSource, settings: { ageCorrection: config.HEARING_AGE_CORRECTION, outcomeCode: config.HEARING_OUTCOME_CODE } }),
  );
  app.use('/api/sites', sitesRouter({ dataSource }));
  app.use('/api/settings', settingsRouter({ dataSource }));
  app.use('/api', groupsRouter({ dataSource }));
  app.use(
    '/api/runs',
    runsRouter({
      dataSource,
      smallCellThreshold: config.SMALL_CELL_THRESHOLD,
      runQuietSeconds: config.RUN_QUIET_SECONDS,
      answerCacheBytes: config.RUN_ANSWER_CACHE_MB * 1024 ** 2,
    }),
  );
  app.use('/api/rules', rulesRouter({ dataSource, smallCellThreshold: config.SMALL_CELL_THRESHOLD }));
  app.use('/api/flags', flagsRouter({ dataSource, smallCellThreshold: config.SMALL_CELL_THRESHOLD }));
  app.use('/api/notices', noticesRouter({ dataSource }));
  app.use('/api/mailbox', mailboxRouter({ dataSource, config }));
  app.use('/api/cases', casesRouter({ dataSource }));
  app.use('/api/periods', periodsRouter({ dataSource, allowFutureMonths: config.INTAKE_ALLOW_FUTURE_MONTHS }));
  app.use('/api/reference-rates', referenceRatesRouter({ dataSource }));
  app.use('/api', notFound);
  app.use(webAppRouter(config.WEB_DIST ?? join(import.meta.dirname, '..', '..', 'web', 'dist')));
  app.use(errorHandler);
  return app;
}

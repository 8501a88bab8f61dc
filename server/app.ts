import express, { type Express } from 'express';
import helmet from 'helmet';
import cookieParser from 'cookie-parser';
import path from 'node:path';
import { existsSync } from 'node:fs';
import type { Sequelize } from 'sequelize';
import { initModels } from './db/associations';
import { SessionKeys } from './lib/session';
import {
  authenticate,
  cookieSettings,
  csrfGuard,
  loadSessionUser,
  type SessionRow,
} from './middleware/authenticate';
import { SessionCache } from './lib/session-cache';
import { errorHandler } from './middleware/error-handler';
import type { Mailer } from './mail/mailer';
import type { Mailbox } from './mail/smtp-fake';
import { authRouter } from './routes/auth/auth.router';
import { userRouter } from './routes/users/user.router';
import { mailRouter } from './routes/mail/mail.router';
import { healthRouter } from './routes/health/health.router';
import { growerRouter } from './routes/growers/grower.router';
import { farmRouter } from './routes/farms/farm.router';
import { fieldRouter } from './routes/fields/field.router';
import { seasonRouter } from './routes/seasons/season.router';
import { planterRouter } from './routes/planters/planter.router';
import { zoneMapRouter } from './routes/zone-maps/zone-map.router';
import { productRouter } from './routes/products/product.router';
import { planterLogbookRouter } from './routes/planters/logbook';
import { logRouter } from './routes/logs/log.router';
import type { FileStore } from './logs/file-store';
import { prescriptionRouter, seedOrderRouter } from './routes/prescriptions/prescription.router';
import { importRouter } from './routes/imports/import.router';
import { boundaryRouter } from './routes/fields/boundary.router';
import { NotFoundError } from './errors';

export type AppDeps = {
  sequelize: Sequelize;
  jwtSecret: string;
  mailer: Mailer;
  /** The local mail catcher, when one runs (development, demo, tests). */
  mailbox?: Mailbox | null;
  appUrl: string;
  version: string;
  cookieSecure?: boolean;
  trustProxy?: number;
  /** Folder of the built client to serve, if any. */
  clientDir?: string;
  /** Where log files are kept, and how a log import is queued (server/logs). */
  files: FileStore;
  enqueueLog: (logId: string) => Promise<void>;
  /** Keep the people behind sessions in memory (server/lib/session-cache.ts); on unless false. */
  sessionCache?: boolean;
};

/** The app's resources that outlive a request; `closeApp` releases them. */
export function closeApp(app: Express) {
  return (app.locals.sessions as SessionCache<unknown> | undefined)?.stop();
}

/** Builds the whole app: middleware, routers and the one error handler. It never listens. */
export function createApp(deps: AppDeps): Express {
  initModels(deps.sequelize);
  const keys = new SessionKeys(deps.jwtSecret);
  const cookie = cookieSettings(deps.cookieSecure ?? false);
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', deps.trustProxy ?? 0);
  app.set('query parser', 'simple');
  // API answers are a person's own data: never stored by a browser or a proxy (ASVS 14.3.2), so an ETag
  // (a SHA-1 of every body) would serve nothing. Static files keep theirs (serve-static sets its own).
  app.set('etag', false);
  app.use(
    helmet({
      contentSecurityPolicy: {
        useDefaults: true,
        directives: {
          'worker-src': ["'self'", 'blob:'],
          'img-src': ["'self'", 'data:', 'blob:'],
          // MapLibre fetches image sources (the coverage raster, drawn in the page) as data: URLs.
          'connect-src': ["'self'", 'data:'],
          'upgrade-insecure-requests': deps.cookieSecure ? [] : null,
        },
      },
      strictTransportSecurity: deps.cookieSecure ? undefined : false,
    }),
  );
  app.use(cookieParser());
  app.use('/api', express.json({ limit: '2mb' }));
  app.use('/api', (_req, res, next) => {
    res.setHeader('Cache-Control', 'no-store');
    next();
  });
  app.use('/api', csrfGuard);
  let sessions: SessionCache<SessionRow> | undefined;
  if (deps.sessionCache !== false) {
    sessions = new SessionCache(deps.sequelize, loadSessionUser);
    app.locals.sessions = sessions;
    void sessions.start();
  }
  app.use('/api', authenticate(keys, cookie, sessions));

  app.use('/api/health', healthRouter(deps.sequelize, deps.version));
  app.use('/api/auth', authRouter({ keys, cookie, mailer: deps.mailer, appUrl: deps.appUrl }));
  app.use('/api/users', userRouter({ mailer: deps.mailer, appUrl: deps.appUrl }));
  app.use('/api/mail', mailRouter(deps.mailbox ?? null));
  app.use('/api/growers', growerRouter());
  app.use('/api/farms', farmRouter());
  app.use('/api/fields', fieldRouter());
  app.use('/api/seasons', seasonRouter());
  app.use('/api/planters', planterLogbookRouter());
  app.use('/api/planters', planterRouter());
  app.use('/api/zone-maps', zoneMapRouter());
  app.use('/api/imports', importRouter());
  app.use('/api/fields', boundaryRouter());
  app.use('/api/products', productRouter());
  app.use('/api/prescriptions', prescriptionRouter({ mailer: deps.mailer, appUrl: deps.appUrl }));
  app.use('/api/seed-orders', seedOrderRouter());
  app.use(
    '/api/logs',
    logRouter({ files: deps.files, enqueue: deps.enqueueLog, mailer: deps.mailer, appUrl: deps.appUrl }),
  );
  app.use('/api', (_req, _res, next) => next(new NotFoundError('Route')));

  if (deps.clientDir && existsSync(path.join(deps.clientDir, 'index.html'))) {
    const dir = deps.clientDir;
    app.use(express.static(dir, { index: false, maxAge: '1h' }));
    // Every other path is a client route: answer the app shell.
    app.get('/{*splat}', (_req, res) => {
      res.set('Cache-Control', 'no-cache');
      res.sendFile(path.join(dir, 'index.html'));
    });
  }
  app.use(errorHandler);
  return app;
}

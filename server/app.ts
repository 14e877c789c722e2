import express, { type Express } from 'express';
import session from 'express-session';
import connectPgSimple from 'connect-pg-simple';
import { readUserWithSession, throttleTouch } from './lib/session-store.js';
import passport from 'passport';
import helmet from 'helmet';
import { csrfSync } from 'csrf-sync';
import fs from 'node:fs';
import path from 'node:path';
import type { Env } from './config/env.js';
import type { Database } from './db/client.js';
import { AppError } from './lib/errors.js';
import { requestId } from './middleware/request-id.js';
import { errorHandler, notFoundHandler } from './middleware/error-handler.js';
import { authRouter, configurePassport } from './modules/auth/auth.router.js';
import { readSession } from './modules/auth/auth.service.js';
import { usersRouter } from './modules/users/users.router.js';
import { settingsRouter } from './modules/settings/settings.router.js';
import { healthRouter } from './modules/health/health.router.js';
import { buildersRouter } from './modules/builders/builders.router.js';
import { communitiesRouter } from './modules/communities/communities.router.js';
import { homesRouter } from './modules/homes/homes.router.js';
import { homeTilesRouter } from './modules/home-tiles/home-tiles.router.js';
import { basemapRouter } from './modules/basemap/basemap.router.js';
import { importsRouter } from './modules/imports/imports.router.js';
import { insightRouter } from './modules/insight/insight.router.js';
import { samplingRouter } from './modules/sampling/sampling.router.js';
import { homeResultsRouter, quotesRouter } from './modules/quotes/quotes.router.js';
import { createMailer } from './modules/mail/mail.service.js';
import { mailRouter } from './modules/mail/mail.router.js';
import { createObjectStorage, type ObjectStorage } from './lib/object-storage.js';
import { fansRouter } from './modules/fans/fans.router.js';
import { visitsRouter } from './modules/visits/visits.router.js';
import { attachmentsRouter, homeAttachmentsRouter } from './modules/attachments/attachments.router.js';

export interface AppDeps {
  env: Env;
  database: Database;
  /** Photo and lab-report storage; by default an S3 client for the configured endpoint. */
  storage?: ObjectStorage;
}

const UNSAFE = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);

/** Builds the Express app; tests import this and listen on an ephemeral port. */
export function createApp({ env, database, storage = createObjectStorage(env) }: AppDeps): Express {
  const app = express();
  const { db, pool } = database;
  app.disable('x-powered-by');
  if (env.TRUST_PROXY > 0) app.set('trust proxy', env.TRUST_PROXY);

  app.use(requestId);
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          defaultSrc: ["'self'"],
          connectSrc: ["'self'"],
          imgSrc: ["'self'", 'data:', 'blob:'],
          workerSrc: ["'self'", 'blob:'],
          childSrc: ["'self'", 'blob:'],
          styleSrc: ["'self'", "'unsafe-inline'"],
          fontSrc: ["'self'", 'data:'],
          upgradeInsecureRequests: null,
        },
      },
      // Plain-HTTP local use must keep working; HSTS belongs to the TLS-terminating proxy.
      strictTransportSecurity: false,
    }),
  );

  app.use('/api/health', healthRouter(pool));
  // Map furniture (style, streets, glyphs) carries no customer data: served before sessions are read.
  app.use(basemapRouter({ attribution: env.BASEMAP_ATTRIBUTION, pmtilesPath: env.BASEMAP_PMTILES }));

  const PgStore = connectPgSimple(session);
  app.use(
    session({
      name: 'tw.sid',
      // Expiry writes at most once a minute per session: a map's burst of tile requests would
      // otherwise each wait on an UPDATE. The idle timeout (at least 5 minutes) may end up to a minute early.
      // A session and its signed-in user are read in one statement (readSession).
      store: readUserWithSession(
        throttleTouch(new PgStore({ pool, tableName: 'session', createTableIfMissing: false, pruneSessionInterval: 15 * 60 }), 60_000),
        (sid) => readSession(db, sid),
      ),
      secret: env.SESSION_SECRET,
      resave: false,
      saveUninitialized: false,
      rolling: true, // the idle timeout restarts with every request
      cookie: {
        httpOnly: true,
        sameSite: 'lax',
        secure: env.COOKIE_SECURE === 'auto' ? 'auto' : env.COOKIE_SECURE === 'true',
        maxAge: env.SESSION_IDLE_MINUTES * 60 * 1000,
      },
    }),
  );
  app.use(passport.initialize());
  app.use(passport.session());
  configurePassport(db);

  app.use('/api', express.json({ limit: '1mb' }));

  // Cross-site request forgery: a foreign Origin is refused outright, and every state-changing
  // request of a signed-in user must echo the session's synchroniser token (OWASP CSRF cheat sheet).
  app.use('/api', (req, _res, next) => {
    const origin = req.get('origin');
    if (UNSAFE.has(req.method) && origin && new URL(origin).host !== req.get('host')) {
      throw new AppError('CSRF_INVALID', 403, 'Cross-origin request refused');
    }
    next();
  });
  const { csrfSynchronisedProtection, generateToken } = csrfSync();
  app.use('/api', (req, res, next) => {
    if (!UNSAFE.has(req.method) || req.path === '/auth/sign-in' || !req.user) return next();
    csrfSynchronisedProtection(req, res, (err?: unknown) => {
      if (err) return next(new AppError('CSRF_INVALID', 403, 'Missing or invalid CSRF token; reload the page'));
      next();
    });
  });

  app.use('/api/auth', authRouter(generateToken));
  app.use('/api/users', usersRouter(db));
  app.use('/api/settings', settingsRouter(db));
  app.use('/api/builders', buildersRouter(db));
  app.use('/api/communities', communitiesRouter(db));
  app.use('/api/homes', homesRouter(db));
  app.use('/api/homes', visitsRouter(db));
  app.use('/api/homes', homeAttachmentsRouter(db, storage));
  app.use('/api/attachments', attachmentsRouter(db, storage));
  app.use('/api/fans', fansRouter(db));
  app.use('/api/imports', importsRouter(database, env));
  const mailer = createMailer({ smtpUrl: env.SMTP_URL, from: env.MAIL_FROM, keepOutbox: env.NODE_ENV !== 'production' });
  app.use('/api/insight', insightRouter(db));
  app.use('/api/sampling', samplingRouter(db));
  app.use('/api/quotes', quotesRouter(db, mailer));
  app.use('/api/home-results', homeResultsRouter(db, mailer));
  app.use('/api/mail', mailRouter(mailer));
  app.use('/api', notFoundHandler);
  app.use('/tiles/homes', homeTilesRouter(database.tiles));

  const clientDist = path.resolve(env.CLIENT_DIST);
  if (fs.existsSync(path.join(clientDist, 'index.html'))) {
    app.use(
      express.static(clientDist, {
        index: false,
        maxAge: '1h',
        setHeaders(res, file) {
          // Hashed assets may be cached; the service worker and its manifest must be re-checked every time,
          // or a phone keeps running an old app shell.
          const name = path.basename(file);
          if (file.includes(`${path.sep}assets${path.sep}`)) res.setHeader('Cache-Control', 'public, max-age=31536000, immutable');
          else if (name === 'sw.js' || name.startsWith('workbox-') || name === 'manifest.webmanifest' || name === 'index.html') res.setHeader('Cache-Control', 'no-cache');
        },
      }),
    );
    // Client-side routes: every other GET gets the app shell.
    app.get('/{*splat}', (_req, res) => res.sendFile(path.join(clientDist, 'index.html'), { headers: { 'Cache-Control': 'no-cache' } }));
  }
  app.use(notFoundHandler);
  app.use(errorHandler);
  return app;
}

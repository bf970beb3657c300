import { existsSync } from 'node:fs';
import { join, resolve } from 'node:path';
import cookieParser from 'cookie-parser';
import express, { type Express } from 'express';
import session from 'express-session';
import { accountSlot, createSessionStore } from './auth/session-store.js';
import helmet from 'helmet';
import pg from 'pg';
import { pinoHttp } from 'pino-http';
import { configurePassport } from './auth/passport.js';
import { SignInService } from './auth/sign-in.js';
import { LIMITS } from '../shared/api.js';
import type { ServerConfig } from './config.js';
import type { EvaluationPool } from './evaluation/pool.js';
import type { Logger } from './logger.js';
import type { Mailer } from './mail/mailer.js';
import { requireAdmin, requireUser } from './middleware/auth.js';
import { csrfProtection } from './middleware/csrf.js';
import { errorHandler, unknownApiRoute } from './middleware/error-handler.js';
import { adminRoutes } from './routes/admin.js';
import { authRoutes } from './routes/auth.js';
import { evaluateRoutes } from './routes/evaluate.js';
import { groupRoutes } from './routes/groups.js';
import { groupInvitationRoutes, invitationRoutes } from './routes/invitations.js';
import { passwordResetRoutes } from './routes/password-reset.js';
import { reviewRoutes } from './routes/reviews.js';
import { activityRoutes } from './routes/activity.js';
import { exportRoutes } from './routes/exports.js';
import { fileRoutes } from './routes/files.js';
import { refereeRoutes } from './routes/referee.js';
import { reportRoutes } from './routes/reports.js';
import { memberRoutes } from './routes/members.js';
import { groupWorksheetRoutes, worksheetRoutes } from './routes/worksheets.js';

export interface AppDeps {
  config: ServerConfig;
  logger: Logger;
  sessionPool: pg.Pool;
  evaluationPool: EvaluationPool;
  mailer: Mailer;
}

/** The Express application: the JSON API under /api and the built client beside it. */
export function createApp({ config, logger, sessionPool, evaluationPool, mailer }: AppDeps): Express {
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', 'loopback');
  app.use(
    pinoHttp({
      logger,
      autoLogging: { ignore: (req) => !req.url?.startsWith('/api') },
      // Requests are logged at debug level (LOG_LEVEL=debug shows them); failures always.
      customLogLevel: (_req, res, err) => (err || res.statusCode >= 500 ? 'error' : 'debug'),
    }),
  );
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          // Monaco and KaTeX set inline styles; scripts stay same-origin only.
          'style-src': ["'self'", "'unsafe-inline'"],
          'img-src': ["'self'", 'data:', 'blob:'],
          'worker-src': ["'self'", 'blob:'],
          'font-src': ["'self'", 'data:'],
          'upgrade-insecure-requests': null,
        },
      },
      hsts: config.secureCookies,
    }),
  );

  const passport = configurePassport();
  // Sign-in back-off in the database: per account and client address, per client address, per account.
  const signIn = new SignInService(mailer, () => config.publicUrl, {
    pairFree: config.loginRateLimit,
    addressFree: 2 * config.loginRateLimit,
    accountFree: LIMITS.failedSignInsBeforeLock,
  });
  const api = express.Router();
  api.use(express.json({ limit: '1mb' }));
  api.use(cookieParser());
  api.use(accountSlot);
  api.use(
    session({
      name: 'sheetwise.sid',
      // No write per request: a session lasts 14 days from sign-in. Nothing is stored for
      // signed-out visitors (their XSRF token is a signed cookie, see middleware/csrf.ts).
      // the session and its account in one query (auth/session-store.ts)
      store: createSessionStore(sessionPool),
      secret: config.sessionSecret,
      resave: false,
      saveUninitialized: false,
      rolling: false,
      cookie: { httpOnly: true, sameSite: 'lax', secure: config.secureCookies, maxAge: 14 * 24 * 3600_000 },
    }),
  );
  api.use(passport.session());
  api.use(csrfProtection(config.sessionSecret, config.secureCookies));

  api.get('/health', (_req, res) => {
    res.json({ ok: true });
  });
  api.use('/auth/password-reset', passwordResetRoutes(config, mailer, logger));
  api.use('/invitations', invitationRoutes(signIn));
  // Referee links: the public view needs no account; managing links does.
  api.use(refereeRoutes(config, evaluationPool));
  api.use('/groups/:groupId/activity', requireUser, activityRoutes());
  api.use('/groups/:groupId/invitations', requireUser, groupInvitationRoutes(config, mailer));
  api.use('/auth', authRoutes({ loginRateLimit: config.loginRateLimit, signIn }));
  api.use('/groups/:groupId/members', requireUser, memberRoutes(config, mailer));
  api.use('/groups/:groupId/worksheets', requireUser, groupWorksheetRoutes());
  api.use('/groups', requireUser, groupRoutes());
  api.use('/worksheets', requireUser, worksheetRoutes(evaluationPool));
  api.use('/evaluate', requireUser, evaluateRoutes(evaluationPool));
  api.use(requireUser, reportRoutes(evaluationPool));
  api.use(requireUser, reviewRoutes(config, mailer));
  api.use(requireUser, fileRoutes(evaluationPool, config));
  api.use(requireUser, exportRoutes(evaluationPool));
  api.use('/admin', requireAdmin, adminRoutes(evaluationPool));
  api.use(unknownApiRoute);
  api.use(errorHandler(logger));
  app.use('/api', api);

  const clientDir = resolve(config.clientDir);
  if (existsSync(join(clientDir, 'index.html'))) {
    app.use(express.static(clientDir, { index: false, maxAge: '1h' }));
    // Client-side routes: every other GET gets the application shell.
    app.get(/.*/, (_req, res) => res.sendFile(join(clientDir, 'index.html'), { maxAge: 0 }));
  } else {
    app.get('/', (_req, res) => res.type('text').send('The client is not built. Run `npm start`, which builds it.'));
  }
  return app;
}

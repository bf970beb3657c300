// Starts the API server: connects, migrates, optionally seeds, listens, and on
// SIGINT/SIGTERM finishes requests in flight before closing the pools.
import type { Server } from 'node:http';
import pg from 'pg';
import type { Sequelize } from 'sequelize';
import { createApp } from './app.js';
import { loadConfig } from './config.js';
import { migrate, seedDemo } from './db/migrate.js';
import { createSequelize } from './db/sequelize.js';
import { EvaluationPool } from './evaluation/pool.js';
import { startCaptureServer } from './mail/capture-server.js';
import { Mailer } from './mail/mailer.js';
import { createLogger } from './logger.js';
import { initModels } from './models/index.js';

export interface RunningServer {
  server: Server;
  mailer: Mailer;
  sequelize: Sequelize;
  url: string;
  stop: () => Promise<void>;
}

export async function startServer(env: NodeJS.ProcessEnv = process.env): Promise<RunningServer> {
  const config = loadConfig(env);
  const logger = createLogger(config.logLevel);
  const sequelize = createSequelize(config.databaseUrl);
  initModels(sequelize);
  await sequelize.authenticate();
  await migrate(sequelize);
  if (env['SHEETWISE_SEED_DEMO'] === '1') await seedDemo(sequelize);

  const sessionPool = new pg.Pool({ connectionString: config.databaseUrl, max: 5 });
  // An idle client that loses its connection (a database restart) must not crash us.
  sessionPool.on('error', (err) => logger.warn({ err: err.message }, 'session pool connection lost'));
  // A client that is checked out when the database goes away emits 'error' on itself,
  // outside the pool's idle handler: give every client a listener of its own.
  sessionPool.on('connect', (client) => client.on('error', (err) => logger.warn({ err: err.message }, 'session connection lost')));
  // Without SMTP_URL, mail goes to the local fake SMTP server, which keeps it in
  // the captured_mail table for the admin's Outbox.
  const capture = env['SMTP_URL'] ? null : await startCaptureServer(sequelize, Number(env['MAIL_CAPTURE_PORT'] ?? 0));
  const mailer = new Mailer(sequelize, env['SMTP_URL'] ?? `smtp://127.0.0.1:${capture!.port}`, logger);
  mailer.start();
  const evaluationPool = new EvaluationPool({
    size: config.evaluationWorkers,
    timeLimitMsPerStatement: config.statementTimeLimitMs,
    maxOldGenerationSizeMb: config.evaluationWorkerMemoryMb,
    logger,
  });
  const app = createApp({ config, logger, sessionPool, evaluationPool, mailer });

  const server = await new Promise<Server>((resolve) => {
    const s = app.listen(config.port, config.host, () => resolve(s));
  });
  const address = server.address();
  const port = typeof address === 'object' && address ? address.port : config.port;
  const url = `http://${config.host}:${port}`;
  // Links in mail point at the address actually listened on unless PUBLIC_URL says otherwise.
  if (!env['PUBLIC_URL']) config.publicUrl = url;
  logger.info({ url }, 'Sheetwise is listening');

  let stopping: Promise<void> | undefined;
  const stop = () =>
    (stopping ??= (async () => {
      await new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeIdleConnections();
      });
      await evaluationPool.close();
      await mailer.stop();
      await capture?.close();
      await sessionPool.end();
      await sequelize.close();
    })());
  return { server, url, stop, mailer, sequelize };
}

const isMain = import.meta.url === `file://${process.argv[1]}` || process.argv[1]?.endsWith('server/main.ts');
if (isMain) {
  startServer()
    .then((running) => {
      const shutdown = () => {
        running.stop().then(
          () => process.exit(0),
          () => process.exit(1),
        );
      };
      process.once('SIGINT', shutdown);
      process.once('SIGTERM', shutdown);
      process.send?.({ type: 'ready', url: running.url });
    })
    .catch((err) => {
      console.error(`Sheetwise could not start: ${err instanceof Error ? err.message : err}`);
      process.exit(1);
    });
}

#!/usr/bin/env node
// `npm start`: dependencies, the development database, the client build, the server.
// Everything it makes lives in the checkout's .data/ folder (or, when PostgreSQL's
// user cannot reach the checkout, under /var/tmp; it says where).
import { spawn } from 'node:child_process';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { ensureDependencies, log, run } from './lib/shell.mjs';

const projectDir = resolve(dirname(fileURLToPath(import.meta.url)), '..');
const port = Number(process.env.PORT ?? 4300);
const pgPort = Number(process.env.SHEETWISE_PG_PORT ?? 54329);

ensureDependencies(projectDir);
// Imported after the install: the helpers need nothing from node_modules, but the
// servers started below do.
const { startCluster, ensureDatabase } = await import('./lib/postgres.mjs');
const { startMailServer } = await import('./lib/mail.mjs').catch(() => ({ startMailServer: null }));

const cluster = startCluster({ projectDir, name: 'postgres-dev', port: pgPort });
log(`PostgreSQL is running on 127.0.0.1:${pgPort}, data in ${cluster.dataDir}`);
ensureDatabase(cluster, 'sheetwise');

if (process.env.SHEETWISE_SKIP_BUILD !== '1') {
  log('Building the client (ng build)…');
  run(join(projectDir, 'node_modules/.bin/ng'), ['build', '--configuration', 'production'], { cwd: projectDir, quiet: true });
  // the command line and the server's evaluation threads, built ahead of time (about a second)
  log('Building the command line and the evaluation threads (scripts/build-cli.mjs)…');
  try {
    run(process.execPath, [join(projectDir, 'scripts/build-cli.mjs')], { cwd: projectDir, quiet: true });
  } catch (e) {
    // not needed to serve: the command line and the threads then run the sources (slower to start)
    log(`The command line was not built: ${e instanceof Error ? e.message : String(e)}`);
  }
}

const env = {
  ...process.env,
  PORT: String(port),
  DATABASE_URL: cluster.url('sheetwise'),
  SHEETWISE_SEED_DEMO: '1',
  PUBLIC_URL: process.env.PUBLIC_URL ?? `http://127.0.0.1:${port}`,
};
const mail = startMailServer ? await startMailServer({ projectDir, env }) : null;
if (mail) Object.assign(env, mail.env);

const server = spawn(join(projectDir, 'node_modules/.bin/tsx'), ['server/main.ts'], {
  cwd: projectDir,
  env,
  stdio: ['ignore', 'inherit', 'inherit', 'ipc'],
});

server.on('message', (message) => {
  if (message?.type !== 'ready') return;
  log(`Sheetwise is ready at ${message.url}`);
  log('Demo accounts (password for each: sheetwise-demo — change it for any real use):');
  for (const role of ['owner', 'author', 'reviewer', 'reader', 'admin']) log(`  ${role.padEnd(8)} ${role}@demo.sheetwise.test`);
  log('Press Ctrl-C to stop the server and the database.');
});

let stopping = false;
function stop(code) {
  if (stopping) return;
  stopping = true;
  log('Stopping…');
  server.kill('SIGTERM');
  const force = setTimeout(() => server.kill('SIGKILL'), 10_000);
  server.once('exit', async () => {
    clearTimeout(force);
    await mail?.stop();
    cluster.stop();
    log('Stopped the server and the database.');
    process.exit(code);
  });
}
process.on('SIGINT', () => stop(0));
process.on('SIGTERM', () => stop(0));
server.on('exit', (code) => {
  if (stopping) return;
  log(`The server exited (code ${code}).`);
  stopping = true;
  mail?.stop();
  cluster.stop();
  process.exit(code ?? 1);
});

// Starts a private PostgreSQL 15 cluster from Debian's packages on loopback.
// Used by `npm start` (the development cluster) and `npm test` (the test cluster):
// each has its own data folder and port, so the two never share data.
import { execFileSync, spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, readdirSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { log, run } from './shell.mjs';

const PG_ROOT = '/usr/lib/postgresql';
const isRoot = process.getuid?.() === 0;

/** The newest installed PostgreSQL server's bin folder, or null. */
function findBinDir() {
  if (!existsSync(PG_ROOT)) return null;
  const versions = readdirSync(PG_ROOT)
    .filter((v) => existsSync(join(PG_ROOT, v, 'bin', 'pg_ctl')))
    .sort((a, b) => Number(b) - Number(a));
  return versions.length ? join(PG_ROOT, versions[0], 'bin') : null;
}

/** Installs Debian's postgresql package when missing (root only), else explains. */
export function ensurePostgresInstalled() {
  let bin = findBinDir();
  if (bin) return bin;
  if (!isRoot) {
    throw new Error(
      'PostgreSQL is not installed. Run: sudo apt-get update && sudo apt-get install -y postgresql',
    );
  }
  log('Installing PostgreSQL from Debian packages (apt-get install postgresql)…');
  run('apt-get', ['update'], { quiet: true });
  run('apt-get', ['install', '-y', '--no-install-recommends', 'postgresql'], {
    quiet: true,
    env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' },
  });
  // Debian's package starts its own cluster on 5432; we do not use it.
  spawnSync('pg_ctlcluster', ['15', 'main', 'stop'], { stdio: 'ignore' });
  bin = findBinDir();
  if (!bin) throw new Error('apt-get finished but no PostgreSQL server binaries were found.');
  return bin;
}

/** Runs a PostgreSQL tool as the postgres OS user when we are root (initdb refuses root). */
function pgTool(bin, tool, args, opts = {}) {
  const cmd = join(bin, tool);
  if (isRoot) return run('runuser', ['-u', 'postgres', '--', cmd, ...args], opts);
  return run(cmd, args, opts);
}

function postgresCanReach(dir) {
  if (!isRoot) return true;
  return spawnSync('runuser', ['-u', 'postgres', '--', 'test', '-x', dir], { stdio: 'ignore' }).status === 0;
}

/**
 * Where the cluster's data lives: `<project>/.data/<name>` when the postgres user can
 * reach the project folder; otherwise (a checkout under /root or in a root-only
 * temporary folder) a folder of its own under /var/tmp, keyed by the checkout's path.
 */
export function dataDirFor(projectDir, name) {
  const local = resolve(projectDir, '.data');
  mkdirSync(local, { recursive: true, mode: 0o755 });
  if (postgresCanReach(local)) return join(local, name);
  const key = createHash('sha256').update(resolve(projectDir)).digest('hex').slice(0, 12);
  const outside = `/var/tmp/sheetwise-${key}`;
  mkdirSync(outside, { recursive: true, mode: 0o755 });
  return join(outside, name);
}

/**
 * Creates (when missing) and starts the cluster; returns its connection facts.
 * A cluster already running in that folder is reused.
 */
export function startCluster({ projectDir, name, port }) {
  const bin = ensurePostgresInstalled();
  const dataDir = dataDirFor(projectDir, name);
  if (!existsSync(join(dataDir, 'PG_VERSION'))) {
    log(`Creating a PostgreSQL cluster in ${dataDir}`);
    if (isRoot) run('install', ['-d', '-o', 'postgres', '-g', 'postgres', '-m', '700', dataDir]);
    else mkdirSync(dataDir, { recursive: true, mode: 0o700 });
    pgTool(bin, 'initdb', ['-D', dataDir, '-U', 'postgres', '--auth=trust', '-E', 'UTF8', '--locale=C.UTF-8'], {
      quiet: true,
    });
  }
  const status = isRoot
    ? spawnSync('runuser', ['-u', 'postgres', '--', join(bin, 'pg_ctl'), '-D', dataDir, 'status'], { stdio: 'ignore' })
    : spawnSync(join(bin, 'pg_ctl'), ['-D', dataDir, 'status'], { stdio: 'ignore' });
  const startedHere = status.status !== 0;
  if (startedHere) {
    pgTool(
      bin,
      'pg_ctl',
      ['-D', dataDir, '-l', join(dataDir, 'server.log'), '-o', `-h 127.0.0.1 -p ${port} -k ${dataDir}`, '-w', 'start'],
      { quiet: true },
    );
  }
  return {
    bin,
    dataDir,
    port,
    url: (db) => `postgres://postgres@127.0.0.1:${port}/${db}`,
    /** False when another run had started it: that run stops it, not this one. */
    startedHere,
    stop: () => stopCluster(bin, dataDir),
  };
}

export function stopCluster(bin, dataDir) {
  try {
    pgTool(bin, 'pg_ctl', ['-D', dataDir, '-m', 'fast', '-w', 'stop'], { quiet: true });
  } catch {
    // Already stopped.
  }
}

/** Creates the database when missing (psql against the maintenance database). */
export function ensureDatabase(cluster, db) {
  const psql = (sql) =>
    execFileSync(join(cluster.bin, 'psql'), ['-h', '127.0.0.1', '-p', String(cluster.port), '-U', 'postgres', '-d', 'postgres', '-tAc', sql], {
      encoding: 'utf8',
    }).trim();
  if (psql(`SELECT 1 FROM pg_database WHERE datname = '${db}'`) !== '1') psql(`CREATE DATABASE "${db}"`);
}

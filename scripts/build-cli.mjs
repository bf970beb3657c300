#!/usr/bin/env node
// Builds the command line and the computation core to JavaScript ahead of time, so that
// `npm run sheetwise` does not transpile TypeScript at every call (tsx: about 1.2 s).
//
//   dist/cli/main.mjs    the main thread (reads files, handles signals, prints)
//   dist/cli/worker.mjs  an evaluation thread: cas/ and shared/ bundled into one module
//   dist/server/evaluation-worker.mjs  the server's evaluation thread (worker-bundle.mjs)
//
// Packages from node_modules stay outside the bundle (Node loads them), except that the
// symbolic algebra package (nerdamer, with its Calculus and Algebra extensions) is
// replaced by a stand-in that loads it with require() on its first use: most
// worksheets never call it, and loading it costs ~40-60 ms of every start.
// Run by `npm run build`; `node scripts/build-cli.mjs --check` exits 1 when the build
// is missing or older than a source file (the same test cas/cli/sheetwise.mjs makes).
import { build } from 'esbuild';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { buildIsCurrent } from '../cas/cli/freshness.mjs';
import { lazyNerdamerPlugin } from './lib/lazy-nerdamer-plugin.mjs';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
export const outDir = join(root, 'dist', 'cli');


export async function buildCli() {
  await build({
    absWorkingDir: root,
    entryPoints: { main: 'cas/cli/main.ts', worker: 'cas/cli/worker.ts' },
    outdir: outDir,
    outExtension: { '.js': '.mjs' },
    bundle: true,
    platform: 'node',
    format: 'esm',
    target: 'node20',
    packages: 'external',
    plugins: [lazyNerdamerPlugin(root)],
    sourcemap: 'linked',
    legalComments: 'none',
    logLevel: 'warning',
  });
}

if (process.argv[1] === fileURLToPath(import.meta.url)) {
  if (process.argv.includes('--check')) {
    const current = buildIsCurrent(root);
    if (!current.ok) { console.error(`dist/cli is ${current.why}: run node scripts/build-cli.mjs`); process.exit(1); }
  } else {
    const t = Date.now();
    await buildCli();
    console.log(`Built the command line to dist/cli/ in ${Date.now() - t} ms.`);
    // The server's evaluation worker, the same core bundled for worker threads (the pool
    // would otherwise build it in the background at its first start).
    const { ensureWorkerBundle } = await import('../server/evaluation/worker-bundle.mjs');
    const t2 = Date.now();
    if (await ensureWorkerBundle()) console.log(`The server's evaluation worker is current in dist/server/ (${Date.now() - t2} ms).`);
    else console.log('The server\'s evaluation worker was not built (esbuild missing or EVALUATION_WORKER_BUNDLE=0): workers run the sources through tsx.');
  }
}

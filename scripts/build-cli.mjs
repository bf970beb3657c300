#!/usr/bin/env node
// Builds the command line and the computation core to JavaScript ahead of time, so that
// `npm run sheetwise` does not transpile TypeScript at every call (tsx: about 1.2 s).
//
//   dist/cli/main.mjs        the main thread (reads files, handles signals, prints)
//   dist/cli/worker.cjs      an evaluation thread's entry (cas/cli/builtWorker.ts)
//   dist/cli/core.cjs        cas/ and shared/ (and complex.js) bundled into one CommonJS
//                            module, which the thread loads through V8's code cache
//   dist/cli/core.cjs.cache  that cache, made here by evaluating warm-up worksheets
//   dist/server/evaluation-worker.mjs  the server's evaluation thread (worker-bundle.mjs)
//
// The symbolic algebra package (nerdamer, with its Calculus and Algebra extensions) is
// replaced by a stand-in that loads it with require() on its first use: most worksheets
// never call it, and loading it costs ~40-60 ms of every start. Other packages are in the
// bundles, so the code cache covers them too.
// Run by `npm run build`; `node scripts/build-cli.mjs --check` exits 1 when the build
// is missing or older than a source file (the same test cas/cli/sheetwise.mjs makes).
import { build } from 'esbuild';
import { existsSync, readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';
import { buildIsCurrent } from '../cas/cli/freshness.mjs';
import { lazyNerdamerPlugin } from './lib/lazy-nerdamer-plugin.mjs';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
export const outDir = join(root, 'dist', 'cli');


/** Worksheets evaluated once after the build, so the code cache holds what they compile (every step kind). */
const WARM_UP = ['test/fixtures/all-step-kinds.swk'];

export async function buildCli() {
  const common = { absWorkingDir: root, outdir: outDir, bundle: true, platform: 'node', target: 'node20', sourcemap: 'linked', legalComments: 'none', logLevel: 'warning' };
  await Promise.all([
    build({ ...common, entryPoints: { main: 'cas/cli/main.ts' }, format: 'esm', outExtension: { '.js': '.mjs' }, packages: 'external' }),
    build({ ...common, entryPoints: { worker: 'cas/cli/builtWorker.ts' }, format: 'cjs', outExtension: { '.js': '.cjs' } }),
    build({ ...common, entryPoints: { core: 'cas/cli/job.ts' }, format: 'cjs', outExtension: { '.js': '.cjs' }, plugins: [lazyNerdamerPlugin(root, 'cjs')] }),
  ]);
  return makeCodeCache();
}

/** Evaluates the warm-up worksheets in a built evaluation thread and has it write its code cache; the cache's size in bytes. */
function makeCodeCache() {
  const worker = new Worker(join(outDir, 'worker.cjs'));
  const jobs = WARM_UP.map((f) => join(root, f)).filter((f) => existsSync(f));
  return new Promise((resolve, reject) => {
    let next = 0;
    const send = () => {
      if (next < jobs.length) {
        const file = jobs[next];
        worker.postMessage({ id: ++next, file, source: readFileSync(file, 'utf8'), limitMs: 20_000, text: true });
      } else worker.postMessage({ type: 'save-code-cache' });
    };
    worker.on('message', (m) => {
      if (m.type === 'failed') { void worker.terminate(); reject(new Error(`the warm-up worksheet ${jobs[m.id - 1]} failed in the built core: ${m.message}`)); }
      else if (m.type === 'done') send();
      else if (m.type === 'code-cache-saved') { void worker.terminate(); resolve(m.bytes); }
    });
    worker.on('error', reject);
    worker.on('exit', (code) => reject(new Error(`the warm-up thread exited with code ${code}`)));
    send();
  });
}

if (process.argv[1] === fileURLToPath(import.meta.url)) {
  if (process.argv.includes('--check')) {
    const current = buildIsCurrent(root);
    if (!current.ok) { console.error(`dist/cli is ${current.why}: run node scripts/build-cli.mjs`); process.exit(1); }
  } else {
    const t = Date.now();
    const cacheBytes = await buildCli();
    console.log(`Built the command line to dist/cli/ in ${Date.now() - t} ms (code cache ${Math.round(cacheBytes / 1024)} KiB).`);
    // The server's evaluation worker, the same core bundled for worker threads (the pool
    // would otherwise build it in the background at its first start).
    const { ensureWorkerBundle } = await import('../server/evaluation/worker-bundle.mjs');
    const t2 = Date.now();
    if (await ensureWorkerBundle()) console.log(`The server's evaluation worker is current in dist/server/ (${Date.now() - t2} ms).`);
    else console.log('The server\'s evaluation worker was not built (esbuild missing or EVALUATION_WORKER_BUNDLE=0): workers run the sources through tsx.');
  }
}

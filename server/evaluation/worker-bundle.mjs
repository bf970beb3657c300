// The evaluation worker built ahead of time: worker.ts with cas/ and shared/ bundled into
// one JavaScript module by esbuild (dist/server/evaluation-worker.mjs), so a worker starts
// in about a third of the time it takes tsx to transpile the sources (measured: about
// 250 ms against 650 ms from `new Worker` to the first small report). Packages stay
// outside the bundle; nerdamer is loaded on its first use, as in the command line build.
//
// The pool starts a build in the background when the bundle is missing or older than one
// of its inputs (esbuild's list of them is kept beside it); until it is there, and when
// esbuild is not installed, workers run the sources through tsx as before. Each worker
// checks the bundle's freshness when it starts (a stat per input, in the worker thread).
// EVALUATION_WORKER_BUNDLE=0 turns it off.
import { readFileSync, renameSync, statSync, mkdirSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { lazyNerdamerPlugin } from '../../scripts/lib/lazy-nerdamer-plugin.mjs';

const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
const OUT = join(root, 'dist', 'server', 'evaluation-worker.mjs');
const INPUTS = join(root, 'dist', 'server', 'evaluation-worker.inputs.json');

const enabled = () => process.env['EVALUATION_WORKER_BUNDLE'] !== '0';

/** The bundle's URL when it is at least as new as every file it was built from, else null. */
export function currentWorkerBundle() {
  if (!enabled()) return null;
  try {
    const built = statSync(OUT).mtimeMs;
    const inputs = JSON.parse(readFileSync(INPUTS, 'utf8'));
    for (const file of inputs) if (statSync(join(root, file)).mtimeMs > built) return null;
    return pathToFileURL(OUT).href;
  } catch {
    return null;
  }
}


let building = null;

/** Builds the bundle when it is missing or stale (once per process; resolves to whether it is current). */
export function ensureWorkerBundle() {
  if (!enabled()) return Promise.resolve(false);
  if (currentWorkerBundle()) return Promise.resolve(true);
  building ??= (async () => {
    let esbuild;
    try {
      esbuild = await import('esbuild');
    } catch {
      return false;
    }
    const tmp = `${OUT}.${process.pid}.${Date.now()}.tmp.mjs`;
    mkdirSync(dirname(OUT), { recursive: true });
    const result = await esbuild.build({
      absWorkingDir: root,
      entryPoints: [join(root, 'server', 'evaluation', 'worker.ts')],
      outfile: tmp,
      bundle: true,
      platform: 'node',
      format: 'esm',
      target: 'node20',
      packages: 'external',
      plugins: [lazyNerdamerPlugin(root)],
      metafile: true,
      legalComments: 'none',
      logLevel: 'silent',
    });
    const inputs = Object.keys(result.metafile.inputs).filter((f) => !f.includes(':') && !f.startsWith('node_modules/'));
    // the list first, then the module by rename: a reader never sees a module without its list
    writeFileSync(`${INPUTS}.${process.pid}.tmp`, JSON.stringify(inputs));
    renameSync(`${INPUTS}.${process.pid}.tmp`, INPUTS);
    renameSync(tmp, OUT);
    return true;
  })().catch(() => false);
  return building;
}

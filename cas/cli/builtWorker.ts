/**
 * The command line's evaluation thread when built (dist/cli/worker.cjs): it loads the core
 * (dist/cli/core.cjs, job.ts and everything it needs in one CommonJS bundle) through V8's
 * code cache (codeCache.ts), then takes each message from the main thread as one job.
 * The build sends a few warm-up jobs and then `save-code-cache`, so the cache holds the
 * bytecode of what they compiled. SHEETWISE_CODE_CACHE_REPORT=1 writes on stderr what
 * became of the cache.
 */
import { renameSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { parentPort } from 'node:worker_threads';
import { loadWithCodeCache } from './codeCache.js';
import type { runJob } from './job.js';
import type { CliJob, CliMessage, SaveCodeCache } from './protocol.js';

const cacheFile = join(__dirname, 'core.cjs.cache');
const core = loadWithCodeCache<{ runJob: typeof runJob }>(join(__dirname, 'core.cjs'), cacheFile);
if (process.env['SHEETWISE_CODE_CACHE_REPORT'] === '1') process.stderr.write(`sheetwise: code cache ${core.status}\n`);

const post = (m: CliMessage) => parentPort!.postMessage(m);

parentPort!.on('message', (m: CliJob | SaveCodeCache) => {
  if ('type' in m) {
    // written whole and then renamed, so a command line starting meanwhile reads the old cache or the new one
    const data = core.cacheData();
    writeFileSync(`${cacheFile}.tmp`, data);
    renameSync(`${cacheFile}.tmp`, cacheFile);
    post({ type: 'code-cache-saved', bytes: data.length });
    return;
  }
  core.exports.runJob(m, post);
});

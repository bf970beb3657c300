/**
 * The command line's evaluation thread run from source (through tsx, when dist/cli/ is
 * missing or stale): each message from the main thread is one job (job.ts).
 */
import { parentPort } from 'node:worker_threads';
import { runJob } from './job.js';
import type { CliJob, CliMessage } from './protocol.js';

parentPort!.on('message', (job: CliJob) => runJob(job, (m: CliMessage) => parentPort!.postMessage(m)));

import { Worker } from 'node:worker_threads';
import type { WorksheetReport } from '../../shared/evaluation.js';
import type { EvaluationTask, WorkerMessage } from './worker.js';

const WORKER_URL = new URL('./worker.ts', import.meta.url);

interface Job {
  source: string;
  timedOut: number[];
  resolve: (report: WorksheetReport) => void;
  reject: (err: Error) => void;
}

export interface PoolOptions {
  size: number;
  timeLimitMsPerStatement: number;
  /** Heap limit per worker; a worksheet that needs more ends with an error, not a dead server. */
  maxOldGenerationSizeMb?: number;
}

/**
 * Worksheet evaluation off the event loop. Each worker runs one worksheet at a time
 * and says when each statement starts; a statement that runs past the limit gets its
 * worker terminated and replaced, and the worksheet is run again with that statement
 * marked as timed out — so the other statements keep their results.
 */
export class EvaluationPool {
  private idle: Worker[] = [];
  private queue: Job[] = [];
  private workers = new Set<Worker>();
  private closed = false;

  constructor(private readonly options: PoolOptions) {}

  evaluate(source: string): Promise<WorksheetReport> {
    if (this.closed) return Promise.reject(new Error('The evaluation pool is shut down.'));
    return new Promise((resolve, reject) => {
      this.queue.push({ source, timedOut: [], resolve, reject });
      this.dispatch();
    });
  }

  async close(): Promise<void> {
    this.closed = true;
    for (const job of this.queue.splice(0)) job.reject(new Error('The server is shutting down.'));
    await Promise.all([...this.workers].map((w) => w.terminate()));
    this.workers.clear();
    this.idle = [];
  }

  private spawn(): Worker {
    const worker = new Worker(WORKER_URL, {
      resourceLimits: { maxOldGenerationSizeMb: this.options.maxOldGenerationSizeMb ?? 512 },
    });
    worker.unref();
    this.workers.add(worker);
    return worker;
  }

  private dispatch(): void {
    while (this.queue.length && (this.idle.length || this.workers.size < this.options.size)) {
      const worker = this.idle.pop() ?? this.spawn();
      this.run(worker, this.queue.shift()!);
    }
  }

  private run(worker: Worker, job: Job): void {
    const limit = this.options.timeLimitMsPerStatement;
    let current = -1;
    let timer: NodeJS.Timeout | undefined;
    let settled = false;
    // A little grace beyond the limit: the core checks its own deadline first and
    // reports a cleaner error when it can.
    const arm = () => {
      clearTimeout(timer);
      timer = setTimeout(() => retire(`time limit`), limit + 500);
    };
    const cleanup = () => {
      settled = true;
      clearTimeout(timer);
      worker.off('message', onMessage);
      worker.off('error', onError);
      worker.off('exit', onExit);
    };
    const retire = (why: string) => {
      if (settled) return;
      cleanup();
      this.workers.delete(worker);
      void worker.terminate();
      if (current < 0 || job.timedOut.includes(current)) {
        job.reject(new Error(`The evaluation worker stopped (${why}) before any statement ran.`));
      } else {
        job.timedOut = [...job.timedOut, current];
        this.queue.unshift(job);
      }
      this.dispatch();
    };
    const onMessage = (message: WorkerMessage) => {
      if (message.type === 'start') {
        current = message.index;
        arm();
      } else {
        cleanup();
        this.idle.push(worker);
        if (message.type === 'done') job.resolve(message.report as WorksheetReport);
        else job.reject(new Error(message.message));
        this.dispatch();
      }
    };
    const onError = (err: Error) => retire(err.message);
    const onExit = () => retire('the worker exited');
    worker.on('message', onMessage);
    worker.on('error', onError);
    worker.on('exit', onExit);
    arm();
    worker.postMessage({ source: job.source, timeLimitMsPerStatement: limit, timedOut: job.timedOut } satisfies EvaluationTask);
  }
}

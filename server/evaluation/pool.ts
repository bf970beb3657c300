import { Worker } from 'node:worker_threads';
import type { StopReason, StoppedStatement } from '../../cas/index.js';
import { worksheetReport, type EvaluationProgress, type WorksheetReport } from '../../shared/evaluation.js';
import type { Logger } from '../logger.js';
import type { EvaluationTask, WorkerMessage } from './worker.js';

const WORKER_URL = new URL('./worker-entry.mjs', import.meta.url);

interface Job {
  source: string;
  /** Statements that already cost a worker; the next run reports them instead of running them. */
  stopped: StoppedStatement[];
  resolve: (report: WorksheetReport) => void;
  reject: (err: Error) => void;
  progress?: ProgressListener;
  signal?: AbortSignal;
  /** Set while a worker runs the job: stops it at once. */
  cancel?: () => void;
}

export interface EvaluateCallOptions {
  /** Aborting (the client went away, or pressed cancel) stops the work. */
  signal?: AbortSignal;
  progress?: ProgressListener;
}

/** Told as each statement starts; `total` is the statement count the limits check found. */
export interface ProgressListener {
  total: number;
  onProgress: (progress: EvaluationProgress) => void;
}

/** A worker's report that does not match the shared schema: an error of that evaluation only. */
export class MalformedReport extends Error {
  constructor() {
    super('The computation returned a report the server could not read; this is a bug, please report it.');
  }
}

export class EvaluationCancelled extends Error {
  constructor() {
    super('The evaluation was cancelled.');
  }
}

export interface PoolOptions {
  size: number;
  timeLimitMsPerStatement: number;
  /** Heap limit per worker in MB (default 512); a statement that needs more gets an error, the server stays up. */
  maxOldGenerationSizeMb?: number;
  /** Where a malformed worker report is logged. */
  logger?: Pick<Logger, 'error'>;
}

/**
 * Worksheet evaluation off the event loop. Each worker runs one worksheet at a time
 * and says when each statement starts. A statement that runs past the time limit,
 * exceeds the heap limit, or kills its worker for any other reason costs that worker:
 * it is replaced, and the worksheet is run again with that statement marked with the
 * reason — so the other statements keep their results and the server stays up.
 */
export class EvaluationPool {
  private idle: Worker[] = [];
  private queue: Job[] = [];
  private workers = new Set<Worker>();
  private closed = false;

  constructor(private readonly options: PoolOptions) {}

  get size(): number {
    return this.options.size;
  }

  private get memoryLimitMb(): number {
    return this.options.maxOldGenerationSizeMb ?? 512;
  }

  /** Workers started so far, the replacements included (for tests and metrics). */
  spawned = 0;

  /** Evaluations asked of the pool (for tests and metrics: a stored report costs none). */
  evaluations = 0;

  evaluate(source: string, options: EvaluateCallOptions = {}): Promise<WorksheetReport> {
    if (this.closed) return Promise.reject(new Error('The evaluation pool is shut down.'));
    if (options.signal?.aborted) return Promise.reject(new EvaluationCancelled());
    this.evaluations += 1;
    return new Promise((resolve, reject) => {
      const job: Job = { source, stopped: [], resolve, reject, progress: options.progress, signal: options.signal };
      options.signal?.addEventListener(
        'abort',
        () => {
          const queued = this.queue.indexOf(job);
          if (queued >= 0) this.queue.splice(queued, 1);
          job.cancel?.();
          reject(new EvaluationCancelled());
        },
        { once: true },
      );
      this.queue.push(job);
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

  /** The worker's report crosses into the server only through the shared schema. */
  private settle(job: Job, report: unknown): void {
    const checked = worksheetReport.safeParse(report);
    if (checked.success) {
      job.resolve(checked.data);
      return;
    }
    this.options.logger?.error({ issues: checked.error.issues.slice(0, 10) }, 'evaluation worker sent a malformed report');
    job.reject(new MalformedReport());
  }

  private spawn(): Worker {
    const worker = new Worker(WORKER_URL, {
      resourceLimits: { maxOldGenerationSizeMb: this.memoryLimitMb },
    });
    worker.unref();
    this.spawned += 1;
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
      timer = setTimeout(() => retire({ reason: 'time' }), limit + 500);
    };
    const cleanup = () => {
      settled = true;
      clearTimeout(timer);
      worker.off('message', onMessage);
      worker.off('error', onError);
      worker.off('exit', onExit);
    };
    const retire = (stop: StopReason) => {
      if (settled || job.signal?.aborted) return;
      cleanup();
      this.workers.delete(worker);
      void worker.terminate();
      if (current < 0 || job.stopped.some((x) => x.index === current)) {
        const why = stop.reason === 'time' ? 'time limit' : stop.reason === 'memory' ? `memory limit of ${stop.limitMb} MB` : stop.detail;
        job.reject(new Error(`The evaluation worker stopped (${why}) before any statement ran.`));
      } else {
        job.stopped = [...job.stopped, { index: current, ...stop }];
        this.queue.unshift(job);
      }
      this.dispatch();
    };
    job.cancel = () => {
      if (settled) return;
      cleanup();
      this.workers.delete(worker);
      void worker.terminate();
      this.dispatch();
    };
    const onMessage = (message: WorkerMessage) => {
      if (message.type === 'start') {
        current = message.index;
        job.progress?.onProgress({ index: message.index, line: message.line, total: job.progress.total });
        arm();
      } else {
        cleanup();
        this.idle.push(worker);
        if (message.type === 'done') this.settle(job, message.report);
        else job.reject(new Error(message.message));
        this.dispatch();
      }
    };
    // Node reports a worker that hit its heap limit by this code on the 'error' event.
    const onError = (err: Error & { code?: string }) =>
      retire(err.code === 'ERR_WORKER_OUT_OF_MEMORY' ? { reason: 'memory', limitMb: this.memoryLimitMb } : { reason: 'crash', detail: err.message });
    const onExit = (code: number) => retire({ reason: 'crash', detail: `the worker exited with code ${code}` });
    worker.on('message', onMessage);
    worker.on('error', onError);
    worker.on('exit', onExit);
    // Before the first statement starts, the worker may still be loading the core.
    timer = setTimeout(() => retire({ reason: 'crash', detail: 'it did not start within 30 s' }), Math.max(limit, 30_000));
    worker.postMessage({ source: job.source, timeLimitMsPerStatement: limit, stopped: job.stopped } satisfies EvaluationTask);
  }
}

import { Worker } from 'node:worker_threads';
import type { StopReason, StoppedStatement } from '../../cas/index.js';
import { worksheetReport, type EvaluationProgress, type WorksheetReport } from '../../shared/evaluation.js';
import type { Logger } from '../logger.js';
import { HttpError } from '../middleware/http-error.js';
import { fairnessSettings, type FairnessSettings } from './fairness-settings.js';
import type { EvaluationTask, WorkerMessage } from './worker.js';
import { ReuseCache } from './reuse.js';
// @ts-expect-error a plain JavaScript module (the worker's entry reads it too)
import { ensureWorkerBundle } from './worker-bundle.mjs';

const WORKER_URL = new URL('./worker-entry.mjs', import.meta.url);

/** An owner without an account (a referee link). */
const isGuest = (owner: string) => owner.startsWith('referee:');

/** Beyond the worker's own stop (vm timeout, 250 ms over the limit): when the pool gives up on a worker. */
const BACKSTOP_MS = 2_000;

interface Job {
  /** Whose evaluation this is ('user:12', 'referee:5'): the pool takes turns between owners. */
  owner: string;
  source: string;
  /** Statements that already cost a worker; the next run reports them instead of running them. */
  stopped: StoppedStatement[];
  /** Statement records made so far (JSON, by statement index): a replacement worker keeps them and goes on after them. */
  done: Map<number, string>;
  /** What is left of the worksheet's total time. */
  budgetLeftMs: number;
  /** Set once the worker has read the worksheet. */
  total: number | null;
  resolve: (report: WorksheetReport) => void;
  reject: (err: Error) => void;
  progress?: ProgressListener;
  signal?: AbortSignal;
  /** Set while a worker runs the job: stops it at once. */
  cancel?: () => void;
}

export interface EvaluateCallOptions {
  /** Aborting (the client went away, or pressed cancel) stops the work, queued or running. */
  signal?: AbortSignal;
  progress?: ProgressListener;
  /** Who asks; evaluations of different owners take turns (default: one shared owner). */
  owner?: string;
}

/** Told what the worker learns as it goes. */
export interface ProgressListener {
  /** Once, when the worker has read the worksheet and found it within the limits: its statement count. */
  onAccepted?: (total: number) => void;
  /** As each statement starts (a statement runs at most once per evaluation). */
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
  /** Workers for evaluations; `fairness.extraWorkers` more may run while several owners wait. */
  size: number;
  timeLimitMsPerStatement: number;
  /** Heap limit per worker in MB (default 512); a statement that needs more gets an error, the server stays up. */
  maxOldGenerationSizeMb?: number;
  /** Where a malformed worker report is logged. */
  logger?: Pick<Logger, 'error'>;
  /** Budgets, caps and sizes (default: from the environment, see fairness-settings.ts). */
  fairness?: Partial<FairnessSettings>;
  /** Keep each owner's recent statement records and reuse those whose key still matches (reuse.ts); default true unless EVALUATION_REUSE=0. */
  reuse?: boolean;
}

/**
 * Worksheet evaluation off the event loop, shared fairly.
 *
 * - Each worker reads (parses) and evaluates one worksheet at a time and says when each
 *   statement starts and what it produced. Nothing proportional to the worksheet runs
 *   on the event loop except reading the final report (capped in size by the worker).
 * - A statement that runs past its limit is stopped inside the worker, which goes on
 *   with the next statement. A worker that does not stop (or runs out of memory, or
 *   dies) is replaced, and the new worker resumes after the statement that cost it,
 *   keeping the records already made: no statement starts twice.
 * - A worksheet has a total time budget besides the per-statement limit.
 * - Queued evaluations are served round robin by owner, owners who run nothing yet
 *   first, so one person's flood never stands in front of another's small evaluation;
 *   such an owner may start one on up to `extraWorkers` workers beyond `size` (all at
 *   low CPU priority, see thread-priority.ts), so a small evaluation does not wait for
 *   a long one to finish either. An owner gets a second worker only while one of the
 *   first `size` is free. Referee links (no account) together use at most `size`
 *   workers, so the extra ones stay for accounts.
 */
export class EvaluationPool {
  private idle: Worker[] = [];
  /** Queued jobs per owner, and the owners in the order they get their next turn. */
  private queues = new Map<string, Job[]>();
  private turns: string[] = [];
  private runningByOwner = new Map<string, number>();
  private workers = new Set<Worker>();
  private closed = false;
  readonly settings: FairnessSettings;
  private readonly reuse: ReuseCache | null;

  constructor(private readonly options: PoolOptions) {
    // workers started before the build is there run the sources through tsx
    void (ensureWorkerBundle as () => Promise<boolean>)();
    this.reuse = (options.reuse ?? process.env['EVALUATION_REUSE'] !== '0') ? new ReuseCache() : null;
    this.settings = { ...fairnessSettings(), ...options.fairness };
  }

  get size(): number {
    return this.options.size;
  }

  private get maxWorkers(): number {
    return this.options.size + this.settings.extraWorkers;
  }

  private get memoryLimitMb(): number {
    return this.options.maxOldGenerationSizeMb ?? 512;
  }

  /** Workers started so far, the replacements included (for tests and metrics). */
  spawned = 0;

  /** Evaluations asked of the pool (for tests and metrics: a stored report costs none). */
  evaluations = 0;

  /** Statements started in workers, over all evaluations (for tests and metrics). */
  statementsStarted = 0;

  /** Statements whose record an earlier evaluation made and that were not computed again (for tests and metrics). */
  statementsReused = 0;

  /** Evaluations waiting for a worker, and running. */
  get load(): { queued: number; running: number } {
    let queued = 0;
    for (const q of this.queues.values()) queued += q.length;
    let running = 0;
    for (const n of this.runningByOwner.values()) running += n;
    return { queued, running };
  }

  evaluate(source: string, options: EvaluateCallOptions = {}): Promise<WorksheetReport> {
    if (this.closed) return Promise.reject(new Error('The evaluation pool is shut down.'));
    if (options.signal?.aborted) return Promise.reject(new EvaluationCancelled());
    this.evaluations += 1;
    return new Promise((resolve, reject) => {
      const job: Job = {
        owner: options.owner ?? 'shared',
        source,
        stopped: [],
        done: new Map(),
        budgetLeftMs: this.settings.worksheetBudgetMs,
        total: null,
        resolve,
        reject,
        progress: options.progress,
        signal: options.signal,
      };
      options.signal?.addEventListener(
        'abort',
        () => {
          this.unqueue(job);
          job.cancel?.();
          reject(new EvaluationCancelled());
        },
        { once: true },
      );
      this.enqueue(job);
      this.dispatch();
    });
  }

  async close(): Promise<void> {
    this.closed = true;
    for (const q of this.queues.values()) for (const job of q.splice(0)) job.reject(new Error('The server is shutting down.'));
    this.queues.clear();
    this.turns = [];
    await Promise.all([...this.workers].map((w) => w.terminate()));
    this.workers.clear();
    this.idle = [];
  }

  private enqueue(job: Job, first = false): void {
    let q = this.queues.get(job.owner);
    if (!q) {
      q = [];
      this.queues.set(job.owner, q);
      this.turns.push(job.owner);
    }
    if (first) q.unshift(job);
    else q.push(job);
  }

  private unqueue(job: Job): void {
    const q = this.queues.get(job.owner);
    const at = q?.indexOf(job) ?? -1;
    if (at >= 0) q!.splice(at, 1);
    if (q && !q.length) this.forgetOwner(job.owner);
  }

  private forgetOwner(owner: string): void {
    this.queues.delete(owner);
    this.turns = this.turns.filter((o) => o !== owner);
  }

  /** The next owner whose turn it is and who passes `may`; moves them to the back. */
  private nextOwner(may: (owner: string) => boolean): string | null {
    for (let i = 0; i < this.turns.length; i++) {
      const owner = this.turns[i]!;
      if (!may(owner)) continue;
      this.turns.splice(i, 1);
      this.turns.push(owner);
      return owner;
    }
    return null;
  }

  /** The worker's report crosses into the server only through the shared schema. */
  private settle(job: Job, json: string): void {
    let report: unknown;
    try {
      report = JSON.parse(json);
    } catch {
      report = null;
    }
    const checked = worksheetReport.safeParse(report);
    if (checked.success) {
      job.resolve(checked.data);
      return;
    }
    this.options.logger?.error({ issues: checked.error?.issues.slice(0, 10) }, 'evaluation worker sent a malformed report');
    job.reject(new MalformedReport());
  }

  private spawn(): Worker {
    const worker = new Worker(WORKER_URL, {
      resourceLimits: { maxOldGenerationSizeMb: this.memoryLimitMb },
    });
    worker.unref();
    // A worker that dies while idle is simply dropped.
    const dropIdle = () => {
      if (this.idle.includes(worker)) {
        this.idle = this.idle.filter((w) => w !== worker);
        this.workers.delete(worker);
      }
    };
    worker.on('exit', dropIdle);
    worker.on('error', dropIdle);
    this.spawned += 1;
    this.workers.add(worker);
    return worker;
  }

  /**
   * Starts queued jobs: first, in turn, those of owners who run nothing yet (up to
   * `size + extraWorkers` workers); then, while one of the first `size` workers is free,
   * more jobs of owners who already run one (the pool is not left idle for fairness).
   */
  private dispatch(): void {
    if (this.closed) return;
    for (;;) {
      const busy = this.load.running;
      // Guests (referee links, no account) together use at most `size` workers: the
      // extra ones stay for accounts, so anonymous traffic cannot hold every worker.
      let guests = 0;
      for (const [o, n] of this.runningByOwner) if (isGuest(o)) guests += n;
      const room = (o: string) => !isGuest(o) || guests < this.options.size;
      let owner = busy < this.maxWorkers ? this.nextOwner((o) => !this.runningByOwner.get(o) && room(o)) : null;
      if (owner === null && busy < this.options.size) owner = this.nextOwner(room);
      if (owner === null) break;
      const q = this.queues.get(owner)!;
      const job = q.shift()!;
      if (!q.length) this.forgetOwner(owner);
      const worker = this.idle.pop() ?? this.spawn();
      this.run(worker, job);
    }
    // Keep one worker warm while work is about, so the next owner does not wait for a
    // worker to load the computation core (about 0.4 s).
    if (!this.idle.length && this.workers.size < this.maxWorkers && this.load.running > 0) this.idle.push(this.spawn());
  }

  private run(worker: Worker, job: Job): void {
    const limit = this.options.timeLimitMsPerStatement;
    const startedAt = Date.now();
    let current = -1;
    let timer: NodeJS.Timeout | undefined;
    let settled = false;
    this.runningByOwner.set(job.owner, (this.runningByOwner.get(job.owner) ?? 0) + 1);
    const arm = (ms: number, stop: StopReason) => {
      clearTimeout(timer);
      timer = setTimeout(() => retire(stop), ms);
    };
    // The whole run may not outlast what is left of the budget (plus the backstop).
    const overall = setTimeout(() => retire({ reason: 'time' }), job.budgetLeftMs + limit + BACKSTOP_MS);
    const cleanup = () => {
      settled = true;
      clearTimeout(timer);
      clearTimeout(overall);
      job.budgetLeftMs = Math.max(0, job.budgetLeftMs - (Date.now() - startedAt));
      job.cancel = undefined;
      worker.off('message', onMessage);
      worker.off('error', onError);
      worker.off('exit', onExit);
      const n = (this.runningByOwner.get(job.owner) ?? 1) - 1;
      if (n > 0) this.runningByOwner.set(job.owner, n);
      else this.runningByOwner.delete(job.owner);
    };
    const retire = (stop: StopReason) => {
      if (settled || job.signal?.aborted) return;
      cleanup();
      this.workers.delete(worker);
      void worker.terminate();
      if (current < 0 || job.stopped.some((x) => x.index === current)) {
        const why = stop.reason === 'time' ? 'time limit' : stop.reason === 'memory' ? `memory limit of ${stop.limitMb} MB` : stop.detail;
        job.reject(new Error(`The evaluation worker stopped (${why}) ${job.total === null ? 'while reading the worksheet' : 'outside any statement'}.`));
      } else {
        // Resume in a new worker after the statement that cost this one.
        job.stopped = [...job.stopped, { index: current, ...stop }];
        this.enqueue(job, true);
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
    const finish = () => {
      cleanup();
      this.idle.push(worker);
      this.dispatch();
    };
    const onMessage = (message: WorkerMessage) => {
      if (settled) return;
      switch (message.type) {
        case 'parsing':
          arm(limit + BACKSTOP_MS, { reason: 'time' });
          return;
        case 'refused':
          finish();
          job.reject(new HttpError(message.status, message.code, message.message));
          return;
        case 'parsed':
          if (job.total === null) {
            job.total = message.statements;
            job.progress?.onAccepted?.(message.statements);
          }
          arm(limit + BACKSTOP_MS, { reason: 'crash', detail: 'it stopped answering between statements' });
          return;
        case 'start':
          current = message.index;
          this.statementsStarted += 1;
          job.progress?.onProgress({ index: message.index, line: message.line, total: job.total ?? 0 });
          arm(limit + BACKSTOP_MS, { reason: 'time' });
          return;
        case 'reused':
          this.statementsReused += message.count;
          return;
        case 'alive':
          // a kept statement computed again for a later one's sake, between statements
          if (current < 0) arm(limit + BACKSTOP_MS, { reason: 'crash', detail: 'it stopped answering between statements' });
          return;
        case 'statement':
          job.done.set(message.index, message.json);
          if (message.key && message.reusable) this.reuse?.keep(job.owner, message.key, message.json, message.line);
          current = -1;
          arm(limit + BACKSTOP_MS, { reason: 'crash', detail: 'it stopped answering between statements' });
          return;
        case 'done':
          finish();
          this.settle(job, message.json);
          return;
        case 'failed':
          finish();
          job.reject(new Error(message.message));
          return;
      }
    };
    // Node reports a worker that hit its heap limit by this code on the 'error' event.
    const onError = (err: Error & { code?: string }) =>
      retire(err.code === 'ERR_WORKER_OUT_OF_MEMORY' ? { reason: 'memory', limitMb: this.memoryLimitMb } : { reason: 'crash', detail: err.message });
    const onExit = (code: number) => retire({ reason: 'crash', detail: `the worker exited with code ${code}` });
    worker.on('message', onMessage);
    worker.on('error', onError);
    worker.on('exit', onExit);
    // Before it starts reading, the worker may still be loading the core.
    arm(Math.max(limit, 30_000), { reason: 'crash', detail: 'it did not start within 30 s' });
    worker.postMessage({
      source: job.source,
      timeLimitMsPerStatement: limit,
      budgetMs: job.budgetLeftMs,
      stopped: job.stopped,
      previous: [...job.done],
      sizes: { statementBytes: this.settings.statementBytes, reportBytes: this.settings.reportBytes },
      reusable: this.reuse?.offer(job.owner, job.source) ?? [],
    } satisfies EvaluationTask);
  }
}

// Runs inside a worker thread: reads (parses) and evaluates one worksheet at a time with
// the computation core, and tells the pool each statement's start and report, so the
// pool can stop a worker that hangs and resume the worksheet after it in a new one.
//
// Everything that costs time in proportion to the worksheet happens here, off the
// server's event loop: the parse, the limits read from it, the statements, the size
// of the report (serialised here; the server gets one string).
import { parentPort } from 'node:worker_threads';
import { evaluateWorksheet, parseWorksheet, type ParsedWorksheet, type StoppedStatement } from '../../cas/index.js';
import { TimeLimitError } from '../../cas/deadline.js';
import type { StatementReport } from '../../shared/evaluation.js';
import { HttpError } from '../middleware/http-error.js';
import { checkParsedLimits, tooDeepToRead } from './limits.js';
import { capStatement, type SizeLimits } from './report-size.js';
import { lowerThisThreadPriority } from './thread-priority.js';
import { reuseKeys } from './reuse.js';
import { guarded } from '../../cas/vm-guard.js';

export interface EvaluationTask {
  source: string;
  timeLimitMsPerStatement: number;
  /** What is left of the worksheet's total time (it shrinks across worker replacements). */
  budgetMs: number;
  stopped: StoppedStatement[];
  /** Statement reports an earlier worker made for this job (as JSON), by statement index. */
  previous: [number, string][];
  sizes: SizeLimits;
  /** Records of earlier evaluations by reuse key (reuse.ts): a statement whose key is here is not computed again. */
  reusable?: [string, string][];
}

export type WorkerMessage =
  | { type: 'parsing' }
  | { type: 'refused'; status: number; code: string; message: string }
  | { type: 'parsed'; statements: number }
  | { type: 'start'; index: number; line: number }
  | { type: 'statement'; index: number; json: string; key: string | null; reusable: boolean; line: string }
  | { type: 'reused'; count: number }
  | { type: 'alive' }
  | { type: 'done'; json: string }
  | { type: 'failed'; message: string };

lowerThisThreadPriority(10);


const post = (m: WorkerMessage) => parentPort!.postMessage(m);

function readWorksheet(task: EvaluationTask): ParsedWorksheet | null {
  try {
    const parsed = guarded(() => parseWorksheet(task.source), task.timeLimitMsPerStatement);
    checkParsedLimits(parsed);
    return parsed;
  } catch (err) {
    const refusal =
      err instanceof HttpError
        ? err
        : err instanceof RangeError
          ? tooDeepToRead()
          : err instanceof TimeLimitError
            ? new HttpError(422, 'worksheet_too_complex', `Reading the worksheet took longer than the time limit of ${task.timeLimitMsPerStatement / 1000} s. Split it into several worksheets.`)
            : null;
    if (!refusal) throw err;
    post({ type: 'refused', status: refusal.status, code: refusal.code, message: refusal.message });
    return null;
  }
}

parentPort!.on('message', (task: EvaluationTask) => {
  try {
    post({ type: 'parsing' });
    const parsed = readWorksheet(task);
    if (!parsed) return;
    post({ type: 'parsed', statements: parsed.lines.length });
    const keys = reuseKeys(task.source, parsed, task.timeLimitMsPerStatement);
    const offered = new Map(task.reusable ?? []);
    const previous = new Map(task.previous);
    const stopped = new Set(task.stopped.map((x) => x.index));
    let reused = 0;
    keys.forEach((key, index) => {
      const json = key ? offered.get(key) : undefined;
      if (json && !previous.has(index) && !stopped.has(index)) {
        previous.set(index, json);
        reused++;
      }
    });
    if (reused) post({ type: 'reused', count: reused });
    let report = evaluate(task, parsed, previous, keys);
    // A fresh run caps the report's size statement by statement; kept records were not
    // counted where they stand, so a report near its cap is made again without them.
    if (reused && report.statements.reduce((n, r) => n + JSON.stringify(r).length, 0) > task.sizes.reportBytes) {
      report = evaluate(task, parsed, new Map(task.previous), keys);
    }
    post({ type: 'done', json: JSON.stringify(report) });
  } catch (err) {
    post({ type: 'failed', message: err instanceof Error ? err.message : String(err) });
  }
});

function evaluate(task: EvaluationTask, parsed: ParsedWorksheet, previousJson: Map<number, string>, keys: (string | null)[]) {
  const previous = [...previousJson].map(([i, json]) => [i, JSON.parse(json) as StatementReport] as const);
  let total = previous.reduce((n, [, r]) => n + JSON.stringify(r).length, 0);
  const lines = task.source.split(/\r?\n/);
  return evaluateWorksheet(task.source, {
    parsed,
    timeLimitMsPerStatement: task.timeLimitMsPerStatement,
    budgetMs: task.budgetMs,
    stopped: task.stopped,
    previous,
    // a kept record's statement may be computed again (silently) for a later one's sake
    guard: (run, limitMs) => {
      post({ type: 'alive' });
      return guarded(run, limitMs);
    },
    onStatementStart: (index, line) => post({ type: 'start', index, line }),
    onStatementDone: (index, r) => {
      // the record's size is decided here, so the server never holds more than the cap
      const capped = capStatement(r, total, task.sizes);
      total += capped.json.length;
      if (capped.report !== r) {
        for (const key of Object.keys(r)) delete (r as Record<string, unknown>)[key];
        Object.assign(r, capped.report);
      }
      post({ type: 'statement', index, json: capped.json, key: keys[index] ?? null, reusable: capped.report.status === 'ok', line: lines[r.line - 1] ?? '' });
    },
  });
}

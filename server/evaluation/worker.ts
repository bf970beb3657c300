// Runs inside a worker thread: evaluates one worksheet with the computation core and
// reports each statement's start, so the pool can stop a statement that runs too long.
import { parentPort } from 'node:worker_threads';
import { evaluateWorksheet, type StoppedStatement } from '../../cas/index.js';
import { lowerThisThreadPriority } from './thread-priority.js';

export interface EvaluationTask {
  source: string;
  timeLimitMsPerStatement: number;
  stopped: StoppedStatement[];
}

export type WorkerMessage =
  | { type: 'start'; index: number; line: number }
  | { type: 'done'; report: unknown }
  | { type: 'failed'; message: string };

lowerThisThreadPriority(10);

parentPort!.on('message', (task: EvaluationTask) => {
  try {
    const report = evaluateWorksheet(task.source, {
      timeLimitMsPerStatement: task.timeLimitMsPerStatement,
      stopped: task.stopped,
      onStatementStart: (index, line) => parentPort!.postMessage({ type: 'start', index, line } satisfies WorkerMessage),
    });
    parentPort!.postMessage({ type: 'done', report } satisfies WorkerMessage);
  } catch (err) {
    parentPort!.postMessage({ type: 'failed', message: err instanceof Error ? err.message : String(err) } satisfies WorkerMessage);
  }
});

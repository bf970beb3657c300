/**
 * One job of the command line's evaluation thread: a worksheet evaluated, each
 * statement's report (with its readable text) posted as soon as it is made. The thread's
 * entry (worker.ts from source, builtWorker.ts when built) hands each message here; the
 * main thread stays free to answer SIGINT/SIGTERM and stops the thread with
 * worker.terminate(), which V8 honours even inside a long statement.
 */
import { evaluateWorksheet, statementText } from '../worksheet.js';
import { parseWorksheet } from '../lang/parse.js';
import { ENGINE_VERSION } from '../version.js';
import { blankReport } from '../statements/context.js';
import type { StatementReport } from '../../shared/evaluation.js';
import { statementLines } from './format.js';
import type { CliJob, CliMessage } from './protocol.js';
import { guarded } from '../vm-guard.js';


/** Evaluates `job`, posting its messages through `post`; never throws (a failure is posted). */
export function runJob(job: CliJob, post: (m: CliMessage) => void): void {
  try {
    const limit = job.limitMs > 0 ? job.limitMs : Infinity;
    const parsed = guarded(() => parseWorksheet(job.source), limit);
    const lines = job.source.split(/\r?\n/);
    post({ type: 'parsed', id: job.id, engine: ENGINE_VERSION, total: parsed.lines.length });
    const send = (index: number, r: StatementReport) => {
      // the source text is set on the whole report at the end; a partial report needs it now
      r.source = statementText(lines[r.line - 1] ?? '');
      post({ type: 'statement', id: job.id, index, report: r, text: job.text ? statementLines(r).join('\n') : '' });
    };
    // lines that did not parse are not told to onStatementDone: sent here, so a stopped run still shows them
    parsed.lines.forEach((entry, index) => {
      if (entry.ok) return;
      const r = blankReport(entry.line, entry.kind as StatementReport['kind'], null);
      r.status = 'error';
      r.error = entry.error;
      send(index, r);
    });
    const report = evaluateWorksheet(job.source, {
      parsed,
      file: job.file,
      timeLimitMsPerStatement: limit,
      guard: guarded,
      onStatementStart: (index, line) => post({ type: 'start', id: job.id, index, line }),
      onStatementDone: send,
    });
    post({ type: 'done', id: job.id, report });
  } catch (err) {
    post({ type: 'failed', id: job.id, message: err instanceof Error ? err.message : String(err) });
  }
}


/**
 * Caps on the size of a report, applied statement by statement in the worker as the
 * records are made: a statement whose record is larger than the per-statement cap, or
 * that would take the report past the total cap, keeps its place in the report with an
 * error saying so instead of its record. The server then never receives, stores or
 * sends more than about the total cap per evaluation, whatever the worksheet.
 */
import type { StatementReport } from '../../shared/evaluation.js';

export interface SizeLimits {
  /** Serialised size of one statement's record (characters of JSON). */
  statementBytes: number;
  /** Serialised size of all the statements' records together. */
  reportBytes: number;
}

const size = (chars: number) => (chars >= 1024 * 1024 ? `${(chars / (1024 * 1024)).toFixed(1)} MB` : `${Math.ceil(chars / 1024)} kB`);

/** The statement's record as sent (JSON), replaced by an error when it is over a cap. */
export function capStatement(report: StatementReport, sentSoFar: number, limits: SizeLimits): { report: StatementReport; json: string } {
  const json = JSON.stringify(report);
  let message: string | null = null;
  if (json.length > limits.statementBytes) {
    message = `This statement's record is ${size(json.length)}, more than the limit of ${size(limits.statementBytes)} for one statement, so it is not shown. Split it into smaller statements (fewer variables per integral, or parts defined with let).`;
  } else if (sentSoFar + json.length > limits.reportBytes) {
    message = `This statement's record is not shown: the worksheet's report reached its limit of ${size(limits.reportBytes)}. Split the worksheet into several worksheets.`;
  }
  if (message === null) return { report, json };
  const column = report.error?.column ?? 1;
  const capped: StatementReport = {
    line: report.line,
    source: report.source,
    kind: report.kind,
    name: report.name,
    status: 'error',
    convergence: null,
    proof: null,
    result: null,
    branch: null,
    steps: [],
    error: { message, line: report.line, column },
  };
  return { report: capped, json: JSON.stringify(capped) };
}

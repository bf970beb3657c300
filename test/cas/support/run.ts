/** Evaluate a worksheet and pick one statement's report. */
import { evaluateWorksheet } from '../../../cas/index.js';
import type { StatementReport } from '../../../shared/evaluation.js';

export function run(source: string) { return evaluateWorksheet(source); }

export function statement(source: string, name: string): StatementReport {
  const r = evaluateWorksheet(source);
  const s = r.statements.find((x) => x.name === name);
  if (!s) throw new Error(`no statement ${name}`);
  return s;
}

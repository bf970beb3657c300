/** Evaluates a worksheet statement by statement; one failure never stops the others. */
import type { StatementReport, WorksheetReport, WorksheetSymbols } from '../shared/evaluation.js';
import type { Statement } from './lang/ast.js';
import { parseWorksheet, type ParsedWorksheet } from './lang/parse.js';
import { statementNames } from './lang/statement-names.js';
import { ENGINE_VERSION } from './version.js';
import { blankReport, newContext, StatementFailure, type Context } from './statements/context.js';
import { evaluateParam } from './statements/param.js';
import { evaluateIntegral } from './statements/integral.js';
import { evaluateExpect } from './statements/expect.js';
import { evaluateNote } from './statements/note.js';
import { evaluateRotate } from './statements/rotate.js';
import { evaluateContinue } from './statements/continue.js';
import { evaluateCompare } from './statements/compare.js';
import { evaluateVerify } from './statements/verify.js';
import { evaluateLet } from './statements/let.js';
import { evaluateLimit } from './statements/limit.js';
import { evaluateMoment } from './statements/moment.js';
import { evaluateDerivative } from './statements/derivative.js';
import { evaluateProduct } from './statements/product.js';
import { evaluateDeterminant } from './statements/determinant.js';
import { evaluateSliced } from './statements/sliced.js';
import { evaluateLatticeSum } from './statements/latticeSum.js';
import { clearDeadline, startDeadline, stoppedMessage, TimeLimitError, timeLimitMessage, type StopReason } from './deadline.js';

export type StoppedStatement = { index: number } & StopReason;

export interface EvaluateOptions {
  /** Per-statement limit in milliseconds (default 5000). */
  timeLimitMsPerStatement?: number;
  /** Called before each statement runs (statement index counts statements only, in source order). */
  onStatementStart?: (index: number, line: number) => void;
  /** Statements a supervisor already stopped (by index): reported with the reason, not run again. */
  stopped?: StoppedStatement[];
  /** Shown as the report's file. */
  file?: string | null;
  /** The worksheet as the caller already parsed it (a supervisor parses under its own limits). */
  parsed?: ParsedWorksheet;
  /**
   * Time for all of the worksheet's statements together, in milliseconds. A statement
   * gets the smaller of its own limit and what is left; once it is used up, the
   * remaining statements are reported as not evaluated (with that reason).
   */
  budgetMs?: number;
  /**
   * Runs each statement's computation; a supervisor can wrap it to stop a statement
   * that does not reach a deadline check in time (it throws TimeLimitError then).
   * `limitMs` is that statement's time limit.
   */
  guard?: <T>(run: () => T, limitMs: number) => T;
  /** Told each statement's report as soon as it is made (statement index as for onStatementStart). */
  onStatementDone?: (index: number, report: StatementReport) => void;
  /**
   * Reports an earlier run already made (a supervisor replaced its worker mid-way): they
   * are kept as they are and the statement does not start again. Such a statement is
   * computed once more, silently, only when a statement still to run uses a name it
   * defines (its value lives only in the worker that died).
   */
  previous?: ReadonlyArray<readonly [number, StatementReport]>;
}

function dispatch(s: Statement, ctx: Context): StatementReport {
  switch (s.kind) {
    case 'param': return evaluateParam(s, ctx);
    case 'integral': return evaluateIntegral(s, ctx);
    case 'expect': return evaluateExpect(s, ctx);
    case 'note': return evaluateNote(s);
    case 'rotate': return evaluateRotate(s, ctx);
    case 'continue': return evaluateContinue(s, ctx);
    case 'compare': return evaluateCompare(s, ctx);
    case 'verify': return evaluateVerify(s, ctx);
    case 'let': return evaluateLet(s, ctx);
    case 'limit': return evaluateLimit(s, ctx);
    case 'moment': return evaluateMoment(s, ctx);
    case 'derivative': return evaluateDerivative(s, ctx);
    case 'product': return evaluateProduct(s, ctx);
    case 'determinant': return evaluateDeterminant(s, ctx);
    case 'sliced': return evaluateSliced(s, ctx);
    case 'sum': return evaluateLatticeSum(s, ctx);
  }
}

function nameOf(s: Statement): string | null {
  switch (s.kind) {
    case 'param': return s.names.map((n) => n.name).join(', ');
    case 'integral': case 'expect': case 'let': case 'moment': case 'derivative': case 'product': case 'determinant': case 'sliced': case 'sum': return s.name.name;
    case 'rotate': return s.as.name;
    case 'compare': return `${s.target.name}, ${s.other.name}`;
    case 'continue': case 'verify': case 'limit': return s.target.name;
    default: return null;
  }
}

/** Results an errored statement would have defined, so that later statements say what they depend on. */
function markUnavailable(s: Statement, ctx: Context, why: string): void {
  if (s.kind === 'integral' || s.kind === 'let' || s.kind === 'rotate') {
    const line = s.span.start.line;
    const n = s.kind === 'rotate' ? s.as.name : s.name.name;
    if (!ctx.results.has(n)) {
      ctx.results.set(n, { line, unavailable: `${n} (line ${line}), which ${why}`, expr: null, params: [], valueAt: null });
    }
  }
  if (s.kind === 'param') {
    for (const n of s.names) if (!ctx.params.has(n.name)) ctx.params.set(n.name, { domain: s.domain, line: s.span.start.line });
  }
}

export function evaluateWorksheet(source: string, options: EvaluateOptions = {}): WorksheetReport {
  const limit = options.timeLimitMsPerStatement ?? 5000;
  const stopped = new Map((options.stopped ?? []).map((x) => [x.index, x]));
  const previous = new Map(options.previous ?? []);
  const parsed = options.parsed ?? parseWorksheet(source);
  const ctx = newContext();
  const statements: StatementReport[] = [];
  const budgetEnd = options.budgetMs === undefined ? Infinity : Date.now() + options.budgetMs;
  const guard = options.guard ?? (<T>(run: () => T) => run());
  const usedAfter = namesUsedAfter(parsed, previous, stopped);
  parsed.lines.forEach((entry, index) => {
    if (!entry.ok) {
      const r = blankReport(entry.line, (entry.kind as StatementReport['kind']), null);
      r.status = 'error';
      r.error = entry.error;
      statements.push(r);
      return;
    }
    const s = entry.statement;
    const line = s.span.start.line;
    const stop = stopped.get(index);
    if (stop) {
      const { message, because } = stoppedMessage(stop, limit);
      const r = blankReport(line, s.kind, nameOf(s));
      r.status = 'error';
      r.error = { message, line, column: s.span.start.column };
      markUnavailable(s, ctx, because);
      statements.push(r);
      return;
    }
    const kept = previous.get(index);
    if (kept) {
      // computed again only to rebuild a value that a statement still to run uses
      if (kept.status === 'ok' && statementNames(s).defined.some((n) => usedAfter[index]!.has(n))) {
        try {
          startDeadline(limit);
          guard(() => dispatch(s, ctx), limit);
        } catch {
          markUnavailable(s, ctx, 'could not be evaluated');
        } finally {
          clearDeadline();
        }
      } else if (kept.status !== 'ok') {
        markUnavailable(s, ctx, 'ended with an error');
      }
      statements.push(kept);
      return;
    }
    // notes and params cost nothing and later statements need them: the budget does not hold them back
    const left = s.kind === 'note' || s.kind === 'param' ? limit : budgetEnd - Date.now();
    if (left <= 0) {
      const r = blankReport(line, s.kind, nameOf(s));
      r.status = 'error';
      r.error = { message: budgetMessage(options.budgetMs!, false), line, column: s.span.start.column };
      markUnavailable(s, ctx, 'was not evaluated (the worksheet used its time budget)');
      statements.push(r);
      options.onStatementDone?.(index, r);
      return;
    }
    const own = Math.min(limit, left);
    options.onStatementStart?.(index, line);
    startDeadline(own);
    let r: StatementReport;
    try {
      r = guard(() => dispatch(s, ctx), own);
      // a NaN or an infinity anywhere in a statement's record is an error, never status ok
      if (hasNonFinite(r)) throw new StatementFailure('The computation produced a number outside double range or undefined (NaN) for this statement; its result is withheld. Check the parameter values, or write a large factor separately with let.', line, s.span.start.column);
    } catch (e) {
      r = blankReport(line, s.kind, nameOf(s));
      r.status = 'error';
      const byBudget = e instanceof TimeLimitError && own < limit;
      if (e instanceof StatementFailure) r.error = { message: e.message, line: e.line, column: e.column };
      else if (byBudget) r.error = { message: budgetMessage(options.budgetMs!, true), line, column: s.span.start.column };
      else if (e instanceof TimeLimitError) r.error = { message: timeLimitMessage(limit), line, column: s.span.start.column };
      else r.error = { message: `Internal error while evaluating this statement: ${e instanceof Error ? e.message : String(e)}`, line, column: s.span.start.column };
      markUnavailable(s, ctx, byBudget ? 'was stopped when the worksheet\'s time budget ran out' : e instanceof TimeLimitError ? 'was stopped at the time limit' : 'ended with an error');
    } finally {
      clearDeadline();
    }
    statements.push(r);
    options.onStatementDone?.(index, r);
  });
  const lines = source.split(/\r?\n/);
  for (const r of statements) r.source = statementText(lines[r.line - 1] ?? '');
  return { file: options.file ?? null, ok: statements.every((r) => r.status === 'ok'), engine: ENGINE_VERSION, symbols: symbolsOf(parsed), statements };
}

/** Why a statement was not evaluated, or was stopped, because the worksheet's total time ran out. */
function budgetMessage(budgetMs: number, running: boolean): string {
  const s = Number((budgetMs / 1000).toPrecision(3));
  return running
    ? `This statement was stopped when the worksheet's time budget of ${s} s ran out. Split the worksheet or simplify the statements before it.`
    : `This statement was not evaluated: the statements before it used the worksheet's time budget of ${s} s. Split the worksheet or simplify the statements before it.`;
}

/** For each statement index, the names that statements after it which still have to run use. */
function namesUsedAfter(parsed: ParsedWorksheet, previous: Map<number, StatementReport>, stopped: Map<number, StoppedStatement>): Set<string>[] {
  const out: Set<string>[] = new Array(parsed.lines.length);
  let acc = new Set<string>();
  for (let i = parsed.lines.length - 1; i >= 0; i--) {
    out[i] = acc;
    const entry = parsed.lines[i]!;
    if (entry.ok && !previous.has(i) && !stopped.has(i)) {
      acc = new Set(acc);
      for (const n of statementNames(entry.statement).used) acc.add(n);
    } else if (entry.ok && previous.has(i) && acc.size) {
      // a statement rebuilt for a later one needs its own inputs too
      const names = statementNames(entry.statement);
      if (names.defined.some((n) => acc.has(n))) {
        acc = new Set(acc);
        for (const n of names.used) acc.add(n);
      }
    }
  }
  return out;
}

/** A line without its trailing comment (a # inside a note's quotes is text, not a comment). */
export function statementText(line: string): string {
  let quoted = false;
  for (let k = 0; k < line.length; k++) {
    const ch = line[k];
    if (ch === '"') quoted = !quoted;
    else if (ch === '#' && !quoted) return line.slice(0, k).trim();
  }
  return line.trim();
}

/** Declared parameters, integration variables and result names, for the editor. */
function symbolsOf(parsed: ParsedWorksheet): WorksheetSymbols {
  const out: WorksheetSymbols = { params: [], variables: [], results: [] };
  const vars = new Set<string>();
  for (const entry of parsed.lines) {
    if (!entry.ok) continue;
    const s = entry.statement;
    const names = statementNames(s);
    if (s.kind === 'param') for (const n of names.defined) out.params.push({ name: n, domain: s.domain, line: entry.line });
    else for (const n of names.defined) out.results.push({ name: n, line: entry.line });
    names.variables.forEach((v) => vars.add(v));
  }
  out.variables = [...vars];
  return out;
}

/** Any number in the report that is NaN or infinite (JSON would turn it into null). */
function hasNonFinite(x: unknown): boolean {
  if (typeof x === 'number') return !Number.isFinite(x);
  if (Array.isArray(x)) return x.some(hasNonFinite);
  if (x && typeof x === 'object') return Object.values(x).some(hasNonFinite);
  return false;
}

/**
 * sheetwise eval FILE [--json] [--time-limit MS] [--progress]
 * sheetwise check DIR [--json] [--time-limit MS] [--jobs N] [--progress]
 *
 * Exit 0: all statements evaluated and every expect held; 1: an expect failed or a
 * statement had an error; 2: usage error or unreadable file; 130/143: stopped by
 * SIGINT/SIGTERM (what was evaluated so far is printed first).
 *
 * This thread only reads files, starts evaluation threads (worker.ts) and prints: the
 * computation is synchronous, so it runs in worker threads and this thread stays free
 * to answer a signal at once (worker.terminate() stops even a statement in the middle
 * of a long step). Each statement has a time limit (STATEMENT_TIME_LIMIT_MS, default
 * 5000 ms, as on the server; --time-limit MS, 0 for none). `check` evaluates the
 * folder's worksheets in parallel threads, one worksheet at a time each.
 *
 * It imports nothing from the core at run time, so this thread starts at once; built
 * by scripts/build-cli.mjs to dist/cli/ and started by cas/cli/sheetwise.mjs.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { availableParallelism } from 'node:os';
import { Worker } from 'node:worker_threads';
import type { StatementReport, WorksheetReport } from '../../shared/evaluation.js';
import type { CliJob, CliMessage } from './protocol.js';

const USAGE = 'Usage: sheetwise eval FILE [--json] [--time-limit MS] [--progress]\n'
  + '       sheetwise check DIR [--json] [--time-limit MS] [--jobs N] [--progress]\n'
  + 'The time limit per statement is STATEMENT_TIME_LIMIT_MS (default 5000 ms); --time-limit 0 removes it.';

class UsageError extends Error {}
class Exit extends Error { constructor(readonly code: number) { super(`exit ${code}`); } }

function fail(message: string): never {
  throw new UsageError(message);
}

function read(file: string): string {
  try { return readFileSync(file, 'utf8'); } catch (e) {
    process.stderr.write(`Cannot read ${file}: ${e instanceof Error ? e.message : String(e)}\n`);
    throw new Exit(2);
  }
}

function worksheetsBelow(dir: string): string[] {
  const out: string[] = [];
  const walk = (d: string) => {
    for (const entry of readdirSync(d, { withFileTypes: true }).sort((a, b) => a.name.localeCompare(b.name))) {
      const p = join(d, entry.name);
      if (entry.isDirectory()) { if (entry.name !== 'node_modules' && !entry.name.startsWith('.')) walk(p); }
      else if (entry.name.endsWith('.swk')) out.push(p);
    }
  };
  walk(dir);
  return out;
}

interface Options { json: boolean; progress: boolean; limitMs: number; jobs: number; args: string[] }

function wholeNumber(flag: string, text: string | undefined, min: number): number {
  if (text === undefined || !/^\d+$/.test(text) || Number(text) < min) fail(`${flag} needs a whole number${min > 0 ? ` of at least ${min}` : ''} (got ${text ?? 'nothing'}).`);
  return Number(text);
}

function options(argv: string[]): Options {
  const envLimit = process.env['STATEMENT_TIME_LIMIT_MS'];
  const o: Options = { json: false, progress: false, limitMs: 5000, jobs: 0, args: [] };
  if (envLimit !== undefined && envLimit !== '') o.limitMs = wholeNumber('STATEMENT_TIME_LIMIT_MS', envLimit, 0);
  for (let k = 0; k < argv.length; k++) {
    const a = argv[k]!;
    const [flag, inline] = a.startsWith('--') && a.includes('=') ? [a.slice(0, a.indexOf('=')), a.slice(a.indexOf('=') + 1)] : [a, undefined];
    const value = () => (inline !== undefined ? inline : argv[++k]);
    if (flag === '--json') o.json = true;
    else if (flag === '--progress') o.progress = true;
    else if (flag === '--time-limit') o.limitMs = wholeNumber('--time-limit', value(), 0);
    else if (flag === '--jobs') o.jobs = wholeNumber('--jobs', value(), 1);
    else if (a.startsWith('-')) fail(`Unknown option ${a}.`);
    else o.args.push(a);
  }
  return o;
}

// ── evaluation threads ──

const fromSource = import.meta.url.endsWith('.ts');
const workerUrl = new URL(fromSource ? './worker.ts' : './worker.cjs', import.meta.url);
/**
 * Run from source (tsx, the fallback when the build is missing or stale), a thread
 * registers tsx's loader itself before it imports worker.ts (Node 20 does not carry
 * the main thread's loader over to a worker's entry module).
 */
function newWorker(): Worker {
  if (!fromSource) return new Worker(workerUrl);
  const api = import.meta.resolve('tsx/esm/api');
  const code = `import(${JSON.stringify(api)}).then((t) => { t.register(); return import(${JSON.stringify(workerUrl.href)}); });`;
  return new Worker(code, { eval: true });
}

interface Handlers {
  onParsed?: (engine: string, total: number) => void;
  onStart?: (index: number, line: number) => void;
  onStatement?: (index: number, report: StatementReport, text: string) => void;
}
type Outcome = { kind: 'done'; report: WorksheetReport } | { kind: 'failed'; message: string };

/** One evaluation thread, one worksheet at a time; a thread that dies is replaced for the next one. */
class Runner {
  private worker: Worker | null = null;
  private current: { id: number; handlers: Handlers; resolve: (o: Outcome) => void } | null = null;
  private nextId = 1;

  constructor() { this.spawn(); }

  private spawn(): void {
    const w = newWorker();
    w.on('message', (m: CliMessage) => {
      const c = this.current;
      if (!c || m.type === 'code-cache-saved' || m.id !== c.id) return;
      switch (m.type) {
        case 'parsed': c.handlers.onParsed?.(m.engine, m.total); break;
        case 'start': c.handlers.onStart?.(m.index, m.line); break;
        case 'statement': c.handlers.onStatement?.(m.index, m.report, m.text); break;
        case 'done': this.current = null; c.resolve({ kind: 'done', report: m.report }); break;
        case 'failed': this.current = null; c.resolve({ kind: 'failed', message: `Internal error: ${m.message}` }); break;
      }
    });
    const died = (why: string) => {
      if (this.worker !== w) return;
      this.worker = null;
      const c = this.current;
      this.current = null;
      c?.resolve({ kind: 'failed', message: `The evaluation stopped unexpectedly (${why}).` });
    };
    w.on('error', (e) => died(e instanceof Error ? e.message : String(e)));
    w.on('exit', (code) => died(`its thread exited with code ${code}`));
    this.worker = w;
  }

  run(job: Omit<CliJob, 'id'>, handlers: Handlers): Promise<Outcome> {
    if (!this.worker) this.spawn();
    const id = this.nextId++;
    return new Promise((resolve) => {
      this.current = { id, handlers, resolve };
      this.worker!.postMessage({ ...job, id } satisfies CliJob);
    });
  }

  stop(): void {
    const w = this.worker;
    this.worker = null;
    void w?.terminate();
  }
}

/**
 * The first thread is started as soon as this module runs, before the arguments are read:
 * it takes ~40 ms to come up, and this thread has nothing else to wait for meanwhile.
 */
let early: Runner | null = ['eval', 'check'].includes(process.argv[2] ?? '') ? new Runner() : null;
function newRunner(): Runner {
  const r = early ?? new Runner();
  early = null;
  runners.push(r);
  return r;
}

// ── signals ──

const SIGNAL_EXIT: Record<string, number> = { SIGINT: 130, SIGTERM: 143 };
let onStop: (signal: string) => void = () => {};
let stopping = false;
const runners: Runner[] = [];
for (const signal of Object.keys(SIGNAL_EXIT)) {
  process.on(signal, () => {
    if (stopping) process.exit(SIGNAL_EXIT[signal]);
    stopping = true;
    for (const r of runners) r.stop();
    try { onStop(signal); } finally { process.exit(SIGNAL_EXIT[signal]); }
  });
}

function progress(o: Options, file: string, line: number): void {
  if (o.progress) process.stderr.write(`sheetwise: ${file} line ${line} started\n`);
}

// ── eval ──

async function evalFile(o: Options, file: string): Promise<number> {
  const source = read(file);
  const runner = newRunner();
  const done = new Map<number, { report: StatementReport; text: string }>();
  let engine = '';
  let total = 0;
  let running: number | null = null;
  const partial = (): WorksheetReport => ({
    file, ok: false, engine, symbols: { params: [], variables: [], results: [] },
    statements: [...done.entries()].sort((a, b) => a[0] - b[0]).map(([, x]) => x.report),
  });
  const partialText = (why: string): string => {
    const head = `${file}: NOT ok (${why}; ${done.size} of ${total} statements evaluated)`;
    const body = [...done.entries()].sort((a, b) => a[0] - b[0]).map(([, x]) => x.text);
    return [head, ...body].join('\n');
  };
  onStop = (signal) => {
    const why = `stopped by ${signal}${running !== null ? ` while evaluating line ${running}` : ''}`;
    process.stdout.write(o.json ? `${JSON.stringify({ ...partial(), stopped: why })}\n` : `${partialText(why)}\n`);
  };
  const outcome = await runner.run({ file, source, limitMs: o.limitMs, text: !o.json }, {
    onParsed: (e, t) => { engine = e; total = t; },
    onStart: (_index, line) => { running = line; progress(o, file, line); },
    onStatement: (index, report, text) => { running = null; done.set(index, { report, text }); },
  });
  runner.stop();
  if (outcome.kind === 'failed') {
    process.stderr.write(`${file}: ${outcome.message}\n`);
    process.stdout.write(o.json ? `${JSON.stringify(partial())}\n` : `${partialText('the evaluation failed')}\n`);
    return 1;
  }
  const r = outcome.report;
  process.stdout.write(o.json ? `${JSON.stringify(r)}\n` : `${[`${r.file ?? '(worksheet)'}: ${r.ok ? 'ok' : 'NOT ok'}`, ...r.statements.map((s, k) => done.get(k)?.text ?? '')].join('\n')}\n`);
  return r.ok ? 0 : 1;
}

// ── check ──

async function checkFolder(o: Options, dir: string): Promise<number> {
  let isDir = false;
  try { isDir = statSync(dir).isDirectory(); } catch { /* reported below */ }
  if (!isDir) { process.stderr.write(`Cannot read the folder ${dir}.\n`); return 2; }
  const files = worksheetsBelow(dir);
  const threads = Math.max(1, Math.min(o.jobs || availableParallelism(), files.length));
  for (let k = 0; k < threads && files.length; k++) newRunner();
  const reports: (WorksheetReport | null)[] = files.map(() => null);
  let printed = 0;
  const line = (r: WorksheetReport) => `${r.ok ? 'ok     ' : 'NOT ok '} ${r.file}`;
  const flush = () => {
    if (o.json) return;
    while (printed < files.length && reports[printed]) process.stdout.write(`${line(reports[printed++]!)}\n`);
  };
  onStop = (signal) => {
    const got = reports.filter((r): r is WorksheetReport => !!r);
    if (o.json) { process.stdout.write(`${JSON.stringify({ ok: false, stopped: `stopped by ${signal}`, files: got })}\n`); return; }
    for (let k = printed; k < files.length; k++) if (reports[k]) process.stdout.write(`${line(reports[k]!)}\n`);
    process.stdout.write(`stopped by ${signal}: ${got.filter((r) => r.ok).length} of ${got.length} worksheets evaluated so far ok, ${files.length - got.length} not evaluated\n`);
  };
  let next = 0;
  await Promise.all(runners.map(async (runner) => {
    while (next < files.length) {
      const k = next++;
      const file = files[k]!;
      let source: string;
      try { source = readFileSync(file, 'utf8'); } catch (e) {
        reports[k] = { file, ok: false, engine: '', symbols: { params: [], variables: [], results: [] }, statements: [] };
        process.stderr.write(`Cannot read ${file}: ${e instanceof Error ? e.message : String(e)}\n`);
        flush();
        continue;
      }
      const got: StatementReport[] = [];
      const outcome = await runner.run({ file, source, limitMs: o.limitMs, text: false }, {
        onStart: (_index, l) => progress(o, file, l),
        onStatement: (_index, report) => { got.push(report); },
      });
      if (outcome.kind === 'failed') process.stderr.write(`${file}: ${outcome.message}\n`);
      reports[k] = outcome.kind === 'done' ? outcome.report : { file, ok: false, engine: '', symbols: { params: [], variables: [], results: [] }, statements: got };
      flush();
    }
    runner.stop();
  }));
  const all = reports as WorksheetReport[];
  const ok = all.every((r) => r.ok);
  if (o.json) process.stdout.write(`${JSON.stringify({ ok, files: all })}\n`);
  else process.stdout.write(`${all.filter((r) => r.ok).length} of ${all.length} worksheets ok\n`);
  return ok ? 0 : 1;
}

export async function main(argv: string[]): Promise<number> {
  try {
    const o = options(argv);
    const [command, target, ...extra] = o.args;
    if (!command || !target || extra.length > 0) fail('');
    if (command === 'eval') return await evalFile(o, target);
    if (command === 'check') return await checkFolder(o, target);
    fail(`Unknown command ${command}.`);
  } catch (e) {
    if (e instanceof UsageError) {
      if (e.message) process.stderr.write(`${e.message}\n`);
      process.stderr.write(`${USAGE}\n`);
      return 2;
    }
    if (e instanceof Exit) return e.code;
    throw e;
  }
}

// leave at once: stdout and stderr are written synchronously (files, pipes and terminals on Linux), and
// waiting for the threads to wind down costs time for nothing
process.exit(await main(process.argv.slice(2)));

/**
 * The command line stops within a second on SIGTERM or SIGINT in the middle of a long
 * statement, with exit code 143/130 and what it had evaluated so far; and the
 * per-statement time limit (STATEMENT_TIME_LIMIT_MS, --time-limit) applies to it.
 * Every process is started in its own process group and stopped by its id.
 */
import { after, test } from 'node:test';
import assert from 'node:assert/strict';
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

// the launcher `npm run sheetwise` runs: the build when it is current, else the sources through tsx
const LAUNCHER = join(process.cwd(), 'cas/cli/sheetwise.mjs');
const dir = mkdtempSync(join(tmpdir(), 'sheetwise-cli-signals-'));

// Three parameters over eight coupled variables: the sampled route, which runs for
// well over a minute on this machine (beyond any time limit used here).
const n = 8;
const squares = Array.from({ length: n }, (_, k) => `x${k + 1}^2`).join(' + ');
const chain = Array.from({ length: n - 1 }, (_, k) => `x${k + 1}*x${k + 2}`).join(' + ');
const pairs = Array.from({ length: n }, (_, a) => Array.from({ length: n - a - 1 }, (_, b) => `x${a + 1}*x${a + b + 2}`)).flat().join(' + ');
const vars = Array.from({ length: n }, (_, k) => `x${k + 1}`).join(', ');
const slow = join(dir, 'slow.swk');
writeFileSync(slow, [
  'param a : positive',
  'param b : real',
  'param c : real',
  `integral D = exp(-a*(${squares})/2 - i*b*(${chain}) - c*(${pairs})/10 + x1 - x2) d(${vars})`,
  'note "after the slow one"',
].join('\n'));

const started: ChildProcess[] = [];
after(() => {
  for (const child of started) if (child.exitCode === null && child.signalCode === null) {
    try { process.kill(-child.pid!, 'SIGKILL'); } catch { /* already gone */ }
  }
});

function startCli(args: string[], env: NodeJS.ProcessEnv = {}): { child: ChildProcess; out: () => string; err: () => string; exited: Promise<{ code: number | null; at: number }> } {
  const child = spawn(process.execPath, [LAUNCHER, ...args], { detached: true, env: { ...process.env, ...env }, stdio: ['ignore', 'pipe', 'pipe'] });
  started.push(child);
  let out = '', err = '';
  child.stdout!.on('data', (d) => { out += d; });
  child.stderr!.on('data', (d) => { err += d; });
  const exited = new Promise<{ code: number | null; at: number }>((resolve) => child.on('close', (code) => resolve({ code, at: Date.now() })));
  return { child, out: () => out, err: () => err, exited };
}

async function until(what: string, ok: () => boolean, ms: number): Promise<void> {
  const end = Date.now() + ms;
  while (!ok()) {
    if (Date.now() > end) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 20));
  }
}

for (const [signal, code] of [['SIGTERM', 143], ['SIGINT', 130]] as const) {
  test(`${signal} during a long statement: stopped within 1 s, exit ${code}, the statements before it printed`, async () => {
    const run = startCli(['eval', slow, '--time-limit', '0', '--progress']);
    // the long statement (line 4) has started: its thread is busy in the middle of it
    await until('line 4 to start', () => /slow\.swk line 4 started/.test(run.err()), 60_000);
    await new Promise((r) => setTimeout(r, 500));
    assert.equal(run.child.exitCode, null, `the statement ended before the signal:\n${run.out()}`);
    const sentAt = Date.now();
    process.kill(run.child.pid!, signal);
    const { code: exitCode, at } = await run.exited;
    assert.ok(at - sentAt < 1000, `stopped ${at - sentAt} ms after ${signal}`);
    assert.equal(exitCode, code);
    const out = run.out();
    assert.match(out, new RegExp(`NOT ok \\(stopped by ${signal} while evaluating line 4; 3 of 5 statements evaluated\\)`));
    assert.match(out, /line 1 {2}param a: ok/);
    assert.match(out, /line 3 {2}param c: ok/);
    assert.doesNotMatch(out, /line 4 {2}integral/);
  });
}

test('SIGTERM to `npm run sheetwise` reaches the command line (the script execs node): exit 143, nothing left running', async () => {
  const child = spawn('npm', ['run', '-s', 'sheetwise', '--', 'eval', slow, '--time-limit', '0', '--progress'], { detached: true, stdio: ['ignore', 'pipe', 'pipe'] });
  started.push(child);
  let out = '', err = '';
  child.stdout!.on('data', (d) => { out += d; });
  child.stderr!.on('data', (d) => { err += d; });
  const exited = new Promise<{ code: number | null; at: number }>((resolve) => child.on('close', (code) => resolve({ code, at: Date.now() })));
  await until('line 4 to start', () => /line 4 started/.test(err), 60_000);
  const sentAt = Date.now();
  process.kill(child.pid!, 'SIGTERM');
  const { code, at } = await exited;
  assert.ok(at - sentAt < 1000, `stopped ${at - sentAt} ms after SIGTERM`);
  assert.equal(code, 143);
  assert.match(out, /stopped by SIGTERM while evaluating line 4/);
  // the process group (npm and what it started) is empty
  assert.throws(() => process.kill(-child.pid!, 0), /ESRCH/);
});

test('SIGTERM with --json: one JSON object with the statements so far', async () => {
  const run = startCli(['eval', slow, '--json', '--time-limit', '0', '--progress']);
  await until('line 4 to start', () => /line 4 started/.test(run.err()), 60_000);
  process.kill(run.child.pid!, 'SIGTERM');
  const { code } = await run.exited;
  assert.equal(code, 143);
  const report = JSON.parse(run.out());
  assert.equal(report.ok, false);
  assert.match(report.stopped, /stopped by SIGTERM while evaluating line 4/);
  assert.deepEqual(report.statements.map((s: { line: number }) => s.line), [1, 2, 3]);
});

test('the statement time limit applies on the command line (--time-limit and STATEMENT_TIME_LIMIT_MS)', () => {
  const cli = (args: string[], env: NodeJS.ProcessEnv = {}) =>
    spawnSync(process.execPath, [LAUNCHER, ...args], { encoding: 'utf8', timeout: 60_000, env: { ...process.env, ...env } });
  for (const r of [cli(['eval', slow, '--time-limit', '400']), cli(['eval', slow], { STATEMENT_TIME_LIMIT_MS: '400' })]) {
    assert.equal(r.status, 1, r.stderr);
    assert.match(r.stdout, /line 4 {2}integral D: error/);
    assert.match(r.stdout, /ran longer than the time limit of 0\.4 s and was stopped/);
    // the statements around it keep their results
    assert.match(r.stdout, /line 3 {2}param c: ok/);
    assert.match(r.stdout, /line 5 {2}note: ok/);
  }
  // the flag wins over the environment; a limit that is not a whole number is a usage error
  assert.match(cli(['eval', slow, '--time-limit=300'], { STATEMENT_TIME_LIMIT_MS: '100000' }).stdout, /time limit of 0\.3 s/);
  assert.equal(cli(['eval', slow, '--time-limit', 'soon']).status, 2);
  assert.equal(cli(['eval', slow], { STATEMENT_TIME_LIMIT_MS: '-5' }).status, 2);
});

/** The command line tool: exit codes 0/1/2 and exactly one JSON object on stdout with --json. */
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync, mkdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { worksheetReport } from '../../shared/evaluation.js';

const TSX = join(process.cwd(), 'node_modules/.bin/tsx');
const cli = (...args: string[]) => spawnSync(TSX, ['cas/cli/main.ts', ...args], { encoding: 'utf8', timeout: 60_000 });

const dir = mkdtempSync(join(tmpdir(), 'sheetwise-cli-'));
const good = join(dir, 'good.swk');
writeFileSync(good, 'param k : positive\nparam lam : real\nintegral Z = exp(-(k*a^2 + 2*i*lam*a*b + k*b^2)/2) d(a, b)\nexpect Z = 2*pi/sqrt(k^2 + lam^2)\n');
const bad = join(dir, 'sub', 'bad.swk');
mkdirSync(join(dir, 'sub'));
writeFileSync(bad, 'integral G = exp(-x^2/2) d(x)\nexpect G = sqrt(pi)\n');

test('eval --json: exit 0 and one JSON object in the documented shape', () => {
  const r = cli('eval', good, '--json');
  assert.equal(r.status, 0, r.stderr);
  const report = worksheetReport.parse(JSON.parse(r.stdout));
  assert.equal(report.file, good);
  assert.equal(report.ok, true);
  const z = report.statements.find((s) => s.kind === 'integral')!;
  assert.equal(z.line, 3);
  assert.equal(z.convergence, 'absolute');
  assert.equal(z.proof, 'proved');
  assert.equal(report.statements.length, 4);
});

test('eval: exit 1 when an expect fails; readable report without --json', () => {
  const r = cli('eval', bad);
  assert.equal(r.status, 1);
  assert.match(r.stdout, /expect G: failed/);
});

test('check DIR: every .swk below it; exit 1 when one is not ok', () => {
  const r = cli('check', dir);
  assert.equal(r.status, 1);
  assert.match(r.stdout, /1 of 2 worksheets ok/);
});

test('check DIR --json --jobs 2: one JSON object, the worksheets in folder order', () => {
  const r = cli('check', dir, '--json', '--jobs', '2');
  assert.equal(r.status, 1, r.stderr);
  const out = JSON.parse(r.stdout);
  assert.equal(out.ok, false);
  assert.deepEqual(out.files.map((f: { file: string }) => f.file), [good, bad]);
  assert.deepEqual(out.files.map((f: unknown) => worksheetReport.parse(f).ok), [true, false]);
});

test('usage errors and unreadable files: exit 2', () => {
  assert.equal(cli().status, 2);
  assert.equal(cli('frobnicate', good).status, 2);
  assert.equal(cli('eval', join(dir, 'missing.swk')).status, 2);
  assert.equal(cli('eval', good, '--yaml').status, 2);
  assert.equal(cli('check', join(dir, 'nowhere')).status, 2);
  assert.equal(cli('check', dir, '--jobs', '0').status, 2);
});

test('the example outputs in README.md and docs/worksheet-language.md are real runs of the current core', () => {
  const r = spawnSync(process.execPath, ['--import', 'tsx', 'scripts/render-examples.ts', '--check'], { encoding: 'utf8' });
  assert.equal(r.status, 0, r.stderr);
});

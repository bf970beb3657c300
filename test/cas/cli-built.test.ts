/**
 * The built command line (scripts/build-cli.mjs: dist/cli/) gives the same reports as the
 * sources, and its evaluation thread loads the core through V8's code cache: used when it
 * was made for this bundle, and when it is stale (the bundle rewritten) or refused by V8
 * (damaged), the core is compiled as usual with the same results.
 */
import { before, test } from 'node:test';
import assert from 'node:assert/strict';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, statSync, utimesSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

const root = process.cwd();
const dir = mkdtempSync(join(tmpdir(), 'sheetwise-cli-built-'));
const sheet = join(dir, 'sheet.swk');
// an integral, a derived quantity with a root squared, a rotation, and an integral whose linear term is a root
// (shown through the algebra package's derivatives, which the built core loads on first use)
writeFileSync(sheet, [
  'param k : positive', 'param g : real',
  'integral Z = exp(-(k*x^2 + 2*i*g*x*y + k*y^2)/2) d(x, y)',
  'let D = (2*pi)^2/Z^2',
  'expect D = k^2 + g^2',
  'param w : positive',
  'integral F = exp(i*w*x^2/2) d(x)',
  'rotate F : x -> exp(i*pi/4)*x as FE',
  'integral H = exp(-k*x^2/2 + sqrt(g^2 + 1)*x) d(x)',
].join('\n'));

const cache = join(root, 'dist/cli/core.cjs.cache');
const built = (env: NodeJS.ProcessEnv = {}) => spawnSync(process.execPath, ['cas/cli/sheetwise.mjs', 'eval', sheet, '--json'], { cwd: root, encoding: 'utf8', timeout: 60_000, env: { ...process.env, SHEETWISE_CODE_CACHE_REPORT: '1', ...env } });
const fromSource = () => spawnSync(join(root, 'node_modules/.bin/tsx'), ['cas/cli/main.ts', 'eval', sheet, '--json'], { cwd: root, encoding: 'utf8', timeout: 60_000 });
const reportOf = (out: string) => { const r = JSON.parse(out); delete r.file; return r; };

before(() => {
  const b = spawnSync(process.execPath, ['scripts/build-cli.mjs'], { cwd: root, encoding: 'utf8', timeout: 120_000 });
  assert.equal(b.status, 0, b.stderr);
  assert.match(b.stdout, /code cache \d+ KiB/);
});

test('the built command line uses its code cache and reports as the sources do', () => {
  const r = built();
  assert.equal(r.status, 0, r.stderr);
  assert.match(r.stderr, /sheetwise: code cache used/);
  const s = fromSource();
  assert.equal(s.status, 0, s.stderr);
  assert.deepEqual(reportOf(r.stdout), reportOf(s.stdout));
  const statements = reportOf(r.stdout).statements as { kind: string; status: string }[];
  assert.ok(statements.every((x) => x.status === 'ok'), 'every statement evaluated');
});

test('a stale or damaged cache is not used, and the results are the same', () => {
  const expected = reportOf(built().stdout);
  const original = readFileSync(cache);
  try {
    // the bundle rewritten (a new modification time): the cache was made for another one
    const core = join(root, 'dist/cli/core.cjs');
    const later = new Date(Date.now() + 2000);
    utimesSync(core, later, later);
    const stale = built();
    assert.match(stale.stderr, /code cache stale/);
    assert.deepEqual(reportOf(stale.stdout), expected);
    // a header that matches and bytes V8 refuses
    const header = `${original.subarray(0, original.indexOf(10) + 1).toString('latin1').replace(/ \S+ \S+\n$/, '')}`;
    const { size, mtimeMs } = statSync(core);
    writeFileSync(cache, Buffer.concat([Buffer.from(`${header} ${size} ${mtimeMs}\n`, 'latin1'), Buffer.alloc(4096, 7)]));
    const damaged = built();
    assert.match(damaged.stderr, /code cache rejected/);
    assert.deepEqual(reportOf(damaged.stdout), expected);
  } finally {
    // a fresh build leaves the cache as it was made
    const b = spawnSync(process.execPath, ['scripts/build-cli.mjs'], { cwd: root, encoding: 'utf8', timeout: 120_000 });
    assert.equal(b.status, 0, b.stderr);
    assert.match(built().stderr, /code cache used/);
  }
});

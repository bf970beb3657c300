#!/usr/bin/env node
// `npm test`: starts what the tests need (a private PostgreSQL test cluster, Debian's
// Chromium, python3 with mpmath), runs every suite, and ends with one line
// "N passed, N failed" for the whole run. Exits non-zero on any failure.
import { spawn } from 'node:child_process';
import { existsSync, readdirSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { ensureChromium, ensureDependencies, ensurePythonMpmath, ensureTex, log } from './lib/shell.mjs';

const projectDir = resolve(dirname(fileURLToPath(import.meta.url)), '..');
const pgPort = Number(process.env.SHEETWISE_TEST_PG_PORT ?? 54339);
const only = process.argv.slice(2); // e.g. `npm test -- api e2e` runs just those suites

ensureDependencies(projectDir);
const python = ensurePythonMpmath();
const chromium = ensureChromium();
ensureTex();
const { startCluster } = await import('./lib/postgres.mjs');
const cluster = startCluster({ projectDir, name: 'postgres-test', port: pgPort });
log(`Test PostgreSQL on 127.0.0.1:${pgPort}, data in ${cluster.dataDir}`);

const env = {
  ...process.env,
  SHEETWISE_TEST_PG: `postgres://postgres@127.0.0.1:${pgPort}`,
  SHEETWISE_PYTHON: python,
  SHEETWISE_CHROMIUM: chromium,
  CHROMIUM_PATH: chromium,
  TEST_OUTPUT_DIR: join(projectDir, 'test-results'),
};
const bin = (name) => join(projectDir, 'node_modules/.bin', name);
const testFiles = (dir) =>
  existsSync(join(projectDir, dir))
    ? readdirSync(join(projectDir, dir)).filter((f) => f.endsWith('.test.ts')).sort().map((f) => join(dir, f))
    : [];

/** Runs a command, echoing its output, and returns the output for counting. */
function runSuite(cmd, args) {
  return new Promise((resolveRun) => {
    const child = spawn(cmd, args, { cwd: projectDir, env, stdio: ['ignore', 'pipe', 'pipe'] });
    let out = '';
    const echo = (stream) => (chunk) => {
      out += chunk;
      stream.write(chunk);
    };
    child.stdout.on('data', echo(process.stdout));
    child.stderr.on('data', echo(process.stderr));
    child.on('close', (code) => resolveRun({ code: code ?? 1, out }));
  });
}

const nodeCounts = (out) => ({
  passed: Number(/ℹ pass (\d+)/.exec(out)?.[1] ?? 0),
  failed: Number(/ℹ fail (\d+)/.exec(out)?.[1] ?? 0) + Number(/ℹ cancelled (\d+)/.exec(out)?.[1] ?? 0),
});
const vitestCounts = (out) => {
  const line = /Tests\s+(.*)\(\d+\)/.exec(out.replace(/\x1b\[[0-9;]*m/g, ''))?.[1] ?? '';
  return { passed: Number(/(\d+) passed/.exec(line)?.[1] ?? 0), failed: Number(/(\d+) failed/.exec(line)?.[1] ?? 0) };
};
const singleCheck = (code) => ({ passed: code === 0 ? 1 : 0, failed: code === 0 ? 0 : 1 });

const nodeTest = (files, concurrency = 1) => [
  '--import',
  'tsx',
  '--test',
  '--test-reporter=spec',
  `--test-concurrency=${concurrency}`,
  ...files,
];

const suites = [
  { name: 'types', run: () => runSuite(bin('tsc'), ['-p', 'tsconfig.server.json']), count: (r) => singleCheck(r.code) },
  { name: 'cas', run: () => runSuite('node', nodeTest(testFiles('test/cas'))), count: (r) => nodeCounts(r.out), files: 'test/cas' },
  { name: 'api', run: () => runSuite('node', nodeTest(testFiles('test/api'), 2)), count: (r) => nodeCounts(r.out), files: 'test/api' },
  { name: 'client', run: () => runSuite(bin('ng'), ['test', '--watch=false']), count: (r) => vitestCounts(r.out) },
  {
    name: 'e2e',
    run: async () => {
      const build = await runSuite(bin('ng'), ['build', '--configuration', 'production']);
      if (build.code !== 0) return { ...build, buildFailed: true };
      return runSuite('node', nodeTest(testFiles('test/e2e')));
    },
    count: (r) => (r.buildFailed ? { passed: 0, failed: 1 } : nodeCounts(r.out)),
    files: 'test/e2e',
  },
];

const totals = { passed: 0, failed: 0 };
const lines = [];
const started = Date.now();
try {
  for (const suite of suites) {
    if (only.length && !only.includes(suite.name)) continue;
    if (suite.files && testFiles(suite.files).length === 0) continue;
    log(`── ${suite.name} ──`);
    const t0 = Date.now();
    const result = await suite.run();
    const counts = suite.count(result);
    // A suite that failed without a failing test (a crash, a load error) still fails the run.
    if (result.code !== 0 && counts.failed === 0) counts.failed = 1;
    totals.passed += counts.passed;
    totals.failed += counts.failed;
    lines.push(`${suite.name.padEnd(7)} ${String(counts.passed).padStart(5)} passed ${String(counts.failed).padStart(4)} failed  ${((Date.now() - t0) / 1000).toFixed(1)} s`);
  }
} finally {
  // A cluster that was running before this run (another run's) is left running.
  if (cluster.startedHere) cluster.stop();
}
log(`Summary (${((Date.now() - started) / 1000).toFixed(0)} s):`);
for (const line of lines) log(`  ${line}`);
console.log(`${totals.passed} passed, ${totals.failed} failed`);
process.exit(totals.failed === 0 && totals.passed > 0 ? 0 : 1);

#!/usr/bin/env node
// `npm run bench`: starts what it needs (the test cluster on loopback, servers of its
// own), runs each benchmark, stops everything, prints one table and writes it as JSON
// under bench/results/ (ignored by git). A benchmark, not a test: nothing here fails
// on a slow number.
import { spawnSync } from 'node:child_process';
import { cpus, totalmem } from 'node:os';
import { mkdirSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { ensureDependencies, log, run } from './lib/shell.mjs';

const projectDir = resolve(dirname(fileURLToPath(import.meta.url)), '..');
ensureDependencies(projectDir);
const { startCluster } = await import('./lib/postgres.mjs');
const pgPort = Number(process.env.SHEETWISE_TEST_PG_PORT ?? 54339);
const cluster = startCluster({ projectDir, name: 'postgres-test', port: pgPort });
const env = { ...process.env, SHEETWISE_TEST_PG: `postgres://postgres@127.0.0.1:${pgPort}` };
const tsx = join(projectDir, 'node_modules/.bin/tsx');

const results = {};
const printed = [];
function bench(title, cmd, args) {
  log(`── ${title} ──`);
  const r = spawnSync(cmd, args, { cwd: projectDir, env, encoding: 'utf8', maxBuffer: 64 * 1024 * 1024 });
  const lines = (r.stdout ?? '').split('\n');
  const human = lines.filter((l) => l && !l.startsWith('BENCH_JSON '));
  for (const l of lines.filter((l) => l.startsWith('BENCH_JSON '))) Object.assign(results, JSON.parse(l.slice(11)));
  if (r.status !== 0) human.push(`(exited with ${r.status}: ${(r.stderr ?? '').trim().split('\n').slice(-3).join(' / ')})`);
  printed.push({ title, human });
  for (const l of human) console.log(l);
}

try {
  bench('computation core: ms per statement kind', tsx, ['bench/cas.bench.ts']);
  bench('command line: whole-process time of npm run sheetwise (built by scripts/build-cli.mjs)', tsx, ['bench/cli.bench.ts']);
  bench('numeric scale: closed form with the branch rule', tsx, ['bench/numeric-scale.bench.ts']);
  bench('parser: depth and size; the server-side limits check', tsx, ['bench/parser.bench.ts']);
  bench('API under load (autocannon, 127.0.0.1)', tsx, ['bench/api-load.bench.ts']);
  bench('fair evaluation: a small evaluation while others flood or abandon', tsx, ['bench/fairness.bench.ts']);
  log('Building the client for its sizes…');
  run(join(projectDir, 'node_modules/.bin/ng'), ['build', '--configuration', 'production'], { cwd: projectDir, quiet: true });
  bench('client bundle sizes', 'node', ['bench/client-size.mjs']);
  bench('keystroke to updated card (headless Chromium)', tsx, ['bench/keystroke.bench.ts']);
  bench('opening a worksheet: navigation to rendered results (headless Chromium)', tsx, ['bench/open-worksheet.bench.ts']);
} finally {
  // A cluster that was running before this run (another run's) is left running.
  if (cluster.startedHere) cluster.stop();
}

const machine = { cores: cpus().length, memoryGiB: Math.round(totalmem() / 2 ** 30), node: process.version, date: new Date().toISOString() };
console.log(`\n=== Sheetwise benchmarks, ${machine.date.slice(0, 10)}, ${machine.cores} cores, ${machine.memoryGiB} GiB, Node ${machine.node} ===`);
for (const { title, human } of printed) {
  console.log(`\n${title}`);
  for (const l of human) console.log(`  ${l}`);
}
const out = join(projectDir, 'bench/results');
mkdirSync(out, { recursive: true });
const file = join(out, `bench-${machine.date.replace(/[:.]/g, '-')}.json`);
writeFileSync(file, JSON.stringify({ machine, ...results }, null, 2));
console.log(`\nWritten to ${file}`);

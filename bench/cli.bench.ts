/**
 * Benchmark of the command line as a whole process (not a timed test): builds it first
 * (scripts/build-cli.mjs), then times, each against its aim:
 *  - `npm run -s sheetwise -- eval` on a one-integral worksheet (aim: median under 150 ms)
 *    and on each demo worksheet (under 300 ms), in ms and as a ratio to a bare
 *    `node -e 0` started in the same run; with, for reference, npm alone running a command
 *    that does nothing, npm and the launcher answering a usage error, and the launcher and
 *    each demo started without npm (as the npm script starts node);
 *  - `sheetwise check` on a folder of 100 worksheets (under 10 s).
 * Prints a `BENCH_JSON` line for scripts/bench.mjs.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { cpus, loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { DEMO_WORKSHEETS } from '../server/db/seeders/demo-data.js';

const root = process.cwd();
const build = spawnSync(process.execPath, ['scripts/build-cli.mjs'], { cwd: root, encoding: 'utf8' });
if (build.status !== 0) { console.log(`build failed: ${build.stderr}`); process.exit(1); }

const dir = mkdtempSync(join(tmpdir(), 'sheetwise-cli-bench-'));
const one = join(dir, 'one-integral.swk');
writeFileSync(one, 'param k : positive\nparam lam : real\nintegral Z = exp(-(k*a^2 + 2*i*lam*a*b + k*b^2)/2) d(a, b)\n');
const demos = DEMO_WORKSHEETS.map((w, k) => {
  const f = join(dir, `demo-${k}.swk`);
  writeFileSync(f, w.source);
  return { title: w.title, file: f };
});

// 100 worksheets: the demo worksheets over and over, and small generated ones between them
const folder = join(dir, 'hundred');
spawnSync('mkdir', ['-p', folder]);
for (let k = 0; k < 100; k++) {
  const name = join(folder, `w${String(k).padStart(3, '0')}.swk`);
  if (k % 2 === 0) writeFileSync(name, DEMO_WORKSHEETS[(k / 2) % DEMO_WORKSHEETS.length]!.source);
  else {
    const a = 1 + (k % 7), b = 1 + (k % 5);
    writeFileSync(name, `param k : positive\nparam g : real\nintegral Z${k} = exp(-(${a}*k*x^2 + 2*i*g*x*y + ${b}*k*y^2)/2) d(x, y)\nexpect Z${k} = 2*pi/sqrt(${a * b}*k^2 + g^2)\n`);
  }
}

function time(cmd: string, args: string[], runs: number, env: NodeJS.ProcessEnv = process.env): { median: number; min: number; max: number; statuses: number[] } {
  const ts: number[] = [];
  const statuses = new Set<number>();
  for (let r = 0; r < runs; r++) {
    const t0 = performance.now();
    const p = spawnSync(cmd, args, { cwd: root, encoding: 'utf8', timeout: 120_000, env });
    ts.push(performance.now() - t0);
    statuses.add(p.status ?? -1);
  }
  ts.sort((a, b) => a - b);
  return { median: ts[Math.floor(ts.length / 2)]!, min: ts[0]!, max: ts[ts.length - 1]!, statuses: [...statuses] };
}

const load = () => loadavg()[0]!.toFixed(2);
const loadBefore = load();
const RUNS = 15;
const bare = time(process.execPath, ['-e', '0'], RUNS);
const npmAlone = time('npm', ['run', '-s', 'env', '--', 'true'], RUNS);
const npmUsage = time('npm', ['run', '-s', 'sheetwise'], RUNS);
// without npm, as its script starts node: without NODE_EXTRA_CA_CERTS (see package.json)
const scriptEnv = { ...process.env };
delete scriptEnv['NODE_EXTRA_CA_CERTS'];
const direct = time(process.execPath, ['cas/cli/sheetwise.mjs', 'eval', one], RUNS, scriptEnv);
const oneRun = time('npm', ['run', '-s', 'sheetwise', '--', 'eval', one], RUNS);
const demoRuns = demos.map((d) => ({ ...d, t: time('npm', ['run', '-s', 'sheetwise', '--', 'eval', d.file], 7), alone: time(process.execPath, ['cas/cli/sheetwise.mjs', 'eval', d.file], 7, scriptEnv) }));
const check = time('npm', ['run', '-s', 'sheetwise', '--', 'check', folder], 3);
const loadAfter = load();
rmSync(dir, { recursive: true, force: true });

const ms = (x: number) => `${x.toFixed(0)} ms`;
const ratio = (x: number) => `${(x / bare.median).toFixed(1)}x node -e 0`;
const verdict = (x: number, aim: number) => `aim < ${aim >= 1000 ? `${aim / 1000} s` : `${aim} ms`}: ${x < aim ? 'reached' : 'NOT reached'}`;
const rows: { what: string; median: number; aim: number | null; ok: boolean | null }[] = [];
const line = (what: string, t: { median: number; min: number; max: number }, aim: number | null, withRatio = true) => {
  rows.push({ what, median: Math.round(t.median), aim, ok: aim === null ? null : t.median < aim });
  console.log(`${what.padEnd(62)} ${ms(t.median).padStart(8)}  (${ms(t.min)}-${ms(t.max)})${withRatio ? `  ${ratio(t.median)}` : ''}${aim !== null ? `  ${verdict(t.median, aim)}` : ''}`);
};
console.log(`${cpus().length} cores; load average ${loadBefore} before, ${loadAfter} after; median of ${RUNS} runs (7 per demo, 3 for check)`);
line('node -e 0 (a bare start, for the ratios)', bare, null, false);
line('npm run -s env -- true (npm alone: a command that does nothing)', npmAlone, null);
line('npm run -s sheetwise (usage error: npm and node, no evaluation)', npmUsage, null);
line('node cas/cli/sheetwise.mjs eval, one integral (without npm)', direct, null);
line('npm run -s sheetwise -- eval, one integral', oneRun, 150);
for (const d of demoRuns) line(`  demo: ${d.title}`, d.t, 300);
for (const d of demoRuns) line(`  without npm: ${d.title}`, d.alone, null);
line('npm run -s sheetwise -- check, a folder of 100 worksheets', check, 10_000, false);
const failed = [...oneRun.statuses, ...demoRuns.flatMap((d) => d.t.statuses)].filter((s) => s !== 0);
if (failed.length) console.log(`(some runs exited with ${[...new Set(failed)].join(', ')})`);
console.log(`BENCH_JSON ${JSON.stringify({ cli: { load: { before: Number(loadBefore), after: Number(loadAfter) }, nodeBareMs: Math.round(bare.median), rows } })}`);

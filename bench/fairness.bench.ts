// Fair evaluation under abuse (a benchmark, never a test): how long another person's
// small evaluation waits (1) alone, (2) while one signed-in user floods the queue with
// long worksheets (as many as the per-account cap lets through, resubmitted as soon as
// one ends or is refused), and (3) while four referee requests on long worksheets are
// started and abandoned after 1 s, over and over. The server runs as a child process
// with the default settings for this machine (EVALUATION_WORKERS = cores - 1).
// "wait" is a small evaluation's response time minus its median response time alone.
import { spawn } from 'node:child_process';
import { ApiClient, DEMO } from '../test/support/api-client.js';
import { createTestDatabase } from '../test/support/test-database.js';

const SAMPLES = Number(process.env['BENCH_FAIRNESS_SAMPLES'] ?? 40);
const SLOW = [
  'param k : positive',
  'param g : real',
  'integral Z3 = exp(-(k*x^2 + k*y^2 + k*z^2 + 2*i*g*x*y + 2*i*g*y*z)/2) d(x, y, z)',
  // 397: the worksheet at the limit of 400 statements
  ...Array.from({ length: 397 }, () => 'verify Z3 at k = 1.3, g = 0.4 with tolerance 1e-15'),
].join('\n');
const SMALL = 'param a : positive\nintegral W = exp(-a*x^2/2) d(x)\nexpect W = sqrt(2*pi/a)';

const db = await createTestDatabase('bench-fairness');
const port = 30000 + Math.floor(Math.random() * 10000);
// its own process group, stopped by its id below
const server = spawn('node_modules/.bin/tsx', ['server/main.ts'], {
  env: { ...process.env, DATABASE_URL: db.url, PORT: String(port), SHEETWISE_SEED_DEMO: '1', LOG_LEVEL: 'silent', LOGIN_RATE_LIMIT: '1000' },
  stdio: ['ignore', 'ignore', 'inherit', 'ipc'],
  detached: true,
});
await new Promise<void>((resolve, reject) => {
  server.on('message', (m: { type?: string }) => m?.type === 'ready' && resolve());
  server.on('exit', (code) => reject(new Error(`server exited with ${code}`)));
});
const base = `http://127.0.0.1:${port}`;
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

const flooder = new ApiClient(base);
await flooder.login(DEMO.author);
const victim = new ApiClient(base);
await victim.login(DEMO.reader);
const groupId = (await flooder.get('/api/groups')).json.groups[0].id;

async function smallEvaluations(n: number): Promise<number[]> {
  const times: number[] = [];
  for (let i = 0; i < n; i++) {
    const t = performance.now();
    const res = await victim.post('/api/evaluate', { source: SMALL + `\nnote "${i}"` });
    times.push(performance.now() - t);
    if (res.status !== 200) throw new Error(`small evaluation answered ${res.status}: ${res.text.slice(0, 200)}`);
    await sleep(150);
  }
  return times;
}
const pct = (xs: number[], p: number) => {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.ceil((p / 100) * s.length) - 1)]!;
};
const r1 = (x: number) => Math.round(x * 10) / 10;

// 1. alone (a few first, to warm the workers)
await smallEvaluations(5);
const alone = await smallEvaluations(SAMPLES);
const baseline = pct(alone, 50);

// 2. one user floods
let flooding = true;
let refused = 0;
let floodRequests = 0;
const floods = Array.from({ length: 4 }, async () => {
  while (flooding) {
    const aborter = new AbortController();
    const stop = setInterval(() => !flooding && aborter.abort(), 100);
    try {
      const res = await flooder.stream('/api/evaluate', { source: SLOW }, aborter.signal);
      floodRequests++;
      if (res.status !== 200 && res.status !== 429) throw new Error(`the flood's worksheet answered ${res.status}: ${(await res.text()).slice(0, 200)}`);
      if (res.status === 429) {
        refused++;
        await res.text();
        await sleep(200);
      } else await res.text();
    } catch (err) {
      if (!aborter.signal.aborted) throw err; // aborted at the end
    } finally {
      clearInterval(stop);
    }
  }
});
await sleep(1500);
const duringFlood = await smallEvaluations(SAMPLES);
flooding = false;
await Promise.all(floods);

// 3. four referee requests started and abandoned after 1 s, over and over
const tokens: string[] = [];
for (let n = 0; n < 4; n++) {
  const made = await flooder.post(`/api/groups/${groupId}/worksheets`, { title: `Long ${n}`, source: SLOW });
  const link = await flooder.post(`/api/worksheets/${made.json.worksheet.id}/referee-links`, { days: 1 });
  tokens.push(/\/referee\/(.+)$/.exec(link.json.link.url)![1]!);
}
let abandoning = true;
const referees = tokens.map(async (token) => {
  while (abandoning) {
    const aborter = new AbortController();
    const req = fetch(`${base}/api/referee/${token}`, { signal: aborter.signal }).then((r) => r.text()).catch(() => undefined);
    await sleep(1000);
    aborter.abort();
    await req;
  }
});
await sleep(1500);
const duringReferees = await smallEvaluations(SAMPLES);
abandoning = false;
await Promise.all(referees);

process.kill(-server.pid!, 'SIGTERM');
await new Promise((r) => server.once('exit', r));
await db.drop();

const row = (xs: number[]) => ({ p50Ms: r1(pct(xs, 50)), p99Ms: r1(pct(xs, 99)), waitP50Ms: r1(Math.max(0, pct(xs, 50) - baseline)), waitP99Ms: r1(Math.max(0, pct(xs, 99) - baseline)), samples: xs.length });
const result = {
  alone: row(alone),
  whileOneUserFloods: { ...row(duringFlood), floodRequests, floodRefused429: refused },
  whileFourRefereeRequestsAreAbandoned: row(duringReferees),
};
console.log('small evaluation                       p50 ms   p99 ms   wait p50   wait p99');
for (const [name, r] of Object.entries(result)) {
  console.log(`${name.padEnd(38)} ${String(r.p50Ms).padStart(6)}   ${String(r.p99Ms).padStart(6)}   ${String(r.waitP50Ms).padStart(8)}   ${String(r.waitP99Ms).padStart(8)}`);
}
console.log(`flood: ${floodRequests} requests, ${refused} refused with 429 (cap per account)`);
console.log(`BENCH_JSON ${JSON.stringify({ fairness: result })}`);

// The API under load on 127.0.0.1 (a benchmark, never a test): 50 signed-in clients
// listing worksheets and opening one; then the same while 20 heavy evaluations run.
// The server runs as a child process, so the load generator does not share its loop; the
// evaluating clients run in a third (bench/support-evaluators.ts) for the same reason.
import { spawn } from 'node:child_process';
import autocannon from 'autocannon';
import { ApiClient, DEMO } from '../test/support/api-client.js';
import { openLoop } from './support/open-loop.js';
import { createTestDatabase } from '../test/support/test-database.js';

const DURATION = Number(process.env['BENCH_SECONDS'] ?? 8);
const HEAVY = `param k : positive
param g : real
param h : real
integral Z3 = exp(-(k*x^2 + k*y^2 + k*z^2 + 2*i*g*x*y + 2*i*h*y*z)/2) d(x, y, z)
integral Z2 = exp(-(k*a^2 + 2*i*g*a*b + k*b^2)/2 + h*a) d(a, b)
integral N3 = exp(-((1/3 + i)*x^2 + (1/3 + i)*y^2 + (1/3 + i)*z^2)/2) d(x, y, z)
`;

const db = await createTestDatabase('bench');
const port = 30000 + Math.floor(Math.random() * 10000);
const server = spawn('node_modules/.bin/tsx', ['server/main.ts'], {
  env: { ...process.env, DATABASE_URL: db.url, PORT: String(port), SHEETWISE_SEED_DEMO: '1', LOG_LEVEL: 'silent', LOGIN_RATE_LIMIT: '1000', EVALUATION_CAP_PER_USER: '20' },
  stdio: ['ignore', 'ignore', 'inherit', 'ipc'],
});
await new Promise<void>((resolve, reject) => {
  server.on('message', (m: { type?: string }) => m?.type === 'ready' && resolve());
  server.on('exit', (code) => reject(new Error(`server exited with ${code}`)));
});
const base = `http://127.0.0.1:${port}`;

// one after another: a burst of sign-ins of one account from a new address meets its back-off by design
const sessions: ApiClient[] = [];
for (let n = 0; n < 50; n++) {
  const c = new ApiClient(base);
  await c.login(n % 2 ? DEMO.author : DEMO.reader);
  sessions.push(c);
}
const groupId = (await sessions[0]!.get('/api/groups')).json.groups[0].id;
const worksheetId = (await sessions[0]!.get(`/api/groups/${groupId}/worksheets`)).json.items[0].id;
const cookieOf = (c: ApiClient) => [...c.cookies].map(([k, v]) => `${k}=${v}`).join('; ');
const admin = new ApiClient(base);
await admin.login(DEMO.admin);

/** 50 connections as fast as the server answers (closed loop: a throughput figure). */
function load(title: string, paths: string[]): Promise<autocannon.Result> {
  let next = 0;
  return autocannon({
    url: base,
    title,
    connections: 50,
    duration: DURATION,
    // Each connection is its own signed-in session (the context is per connection).
    requests: paths.map((path) => ({
      method: 'GET',
      path,
      setupRequest: (req: Record<string, unknown>, context: { cookie?: string }) => {
        context.cookie ??= cookieOf(sessions[next++ % sessions.length]!);
        return { ...req, headers: { ...(req['headers'] as object), cookie: context.cookie } };
      },
    })),
  });
}

const summary = (r: autocannon.Result) => ({
  statusCodes: (r as unknown as { statusCodeStats?: Record<string, { count: number }> }).statusCodeStats,
  requestsPerSecond: Math.round(r.requests.average),
  p50Ms: r.latency.p50,
  p99Ms: r.latency.p99,
  errors: r.errors + r.non2xx,
});

const listAndOpen = await load('list and open', [`/api/groups/${groupId}/worksheets`, `/api/worksheets/${worksheetId}`]);

await admin.get('/api/admin/metrics?reset=1');
const evaluators = spawn('node_modules/.bin/tsx', ['bench/support-evaluators.ts'], {
  env: { ...process.env, BASE: base, SOURCE: HEAVY, COOKIES: JSON.stringify(sessions.slice(0, 20).map((c) => [...c.cookies])) },
  stdio: ['ignore', 'ignore', 'inherit', 'ipc'],
  detached: true, // its own process group, stopped by its id
});
await new Promise<void>((resolve) => evaluators.on('message', (m: { type?: string }) => m?.type === 'ready' && resolve()));
const listDuringEvaluation = await load('list while evaluating', [`/api/groups/${groupId}/worksheets`]);
// The same at an offered rate below the server's capacity, arriving as independent users
// do (Poisson, open loop): latency without the queue that 50 connections firing back to
// back build up in front of one event loop.
const PACED_RATE = 150;
const listPacedDuringEvaluation = await openLoop({ base, path: `/api/groups/${groupId}/worksheets`, rate: PACED_RATE, seconds: DURATION, cookies: sessions.map(cookieOf) });
const finished = new Promise<number>((resolve) => evaluators.on('message', (m: { type?: string; completed?: number }) => m?.type === 'done' && resolve(m.completed!)));
process.kill(-evaluators.pid!, 'SIGTERM');
const evaluations = await finished;
const metrics = (await admin.get('/api/admin/metrics')).json;

server.kill('SIGTERM');
await new Promise((r) => server.once('exit', r));
await db.drop();

const result = {
  listAndOpen: summary(listAndOpen),
  listDuringEvaluation: { ...summary(listDuringEvaluation), evaluationsCompleted: evaluations, eventLoopDelayMs: metrics.eventLoopDelayMs },
  [`listAt${PACED_RATE}PerSecWhileEvaluating`]: listPacedDuringEvaluation,
};
console.log('scenario                         req/s   p50 ms   p99 ms   errors');
for (const [name, r] of Object.entries(result)) {
  console.log(`${name.padEnd(32)} ${String(r.requestsPerSecond).padStart(5)}   ${String(r.p50Ms).padStart(6)}   ${String(r.p99Ms).padStart(6)}   ${r.errors}`);
}
console.log(`evaluations completed meanwhile: ${evaluations}; server event-loop delay p99 ${metrics.eventLoopDelayMs.p99} ms, max ${metrics.eventLoopDelayMs.max} ms`);
const AIM_MS = 100;
console.log(
  `list at ${PACED_RATE} requests/s (Poisson arrivals, open loop) while 20 clients evaluate: p99 ${listPacedDuringEvaluation.p99Ms} ms (max ${listPacedDuringEvaluation.maxMs} ms, ${listPacedDuringEvaluation.sent} requests), aim p99 < ${AIM_MS} ms: ${listPacedDuringEvaluation.p99Ms < AIM_MS ? 'reached' : 'NOT reached'}`,
);
console.log(`BENCH_JSON ${JSON.stringify({ apiLoad: result })}`);

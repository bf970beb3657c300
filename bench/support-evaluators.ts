// The evaluating clients of bench/api-load.bench.ts, in a process of their own: parsing 20
// clients' reports in the load generator's process would delay its timers and inflate the
// latencies it measures for the list (a client elsewhere does not share that loop).
// Input (env): BASE, COOKIES (JSON list of cookie jars), SOURCE. Runs until SIGTERM, then
// prints the number of completed evaluations as JSON.
import { ApiClient } from '../test/support/api-client.js';

const base = process.env['BASE']!;
const jars = JSON.parse(process.env['COOKIES']!) as [string, string][][];
const source = process.env['SOURCE']!;
let completed = 0;
let running = true;
process.on('SIGTERM', () => { running = false; });
const clients = jars.map((jar) => {
  const c = new ApiClient(base);
  for (const [k, v] of jar) c.cookies.set(k, v);
  return c;
});
process.send?.({ type: 'ready' });
await Promise.all(clients.map(async (c, n) => {
  while (running) {
    // A different comment on the first line at every run: no statement record can be reused
    // (server/evaluation/reuse.ts), so each evaluation computes the whole worksheet.
    const res = await c.post('/api/evaluate', { source: source.replace('\n', ` # run ${n}-${completed}\n`) });
    if (res.status === 200) completed++;
  }
}));
process.send?.({ type: 'done', completed });

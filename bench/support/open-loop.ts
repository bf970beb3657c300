// An open-loop load generator: requests arrive as a Poisson process at a given mean rate,
// each sent at its arrival time whether or not earlier ones have been answered, and each
// latency counted from the arrival time (so a stalled server cannot hide its queue:
// no coordinated omission). Independent users arrive this way (common practice in
// queueing models). autocannon's `overallRate` instead starts every connection's timer
// together, so 50 connections at 3 requests/s each arrive as one burst of 50 every 333 ms,
// which measures how a burst drains rather than what a request waits.
import { Agent, request } from 'node:http';

export interface OpenLoopResult {
  requestsPerSecond: number;
  p50Ms: number;
  p99Ms: number;
  maxMs: number;
  errors: number;
  sent: number;
}

export async function openLoop(o: { base: string; path: string; rate: number; seconds: number; cookies: string[]; seed?: number }): Promise<OpenLoopResult> {
  const url = new URL(o.base);
  const agent = new Agent({ keepAlive: true, maxSockets: 64 });
  // A small deterministic generator, so two runs offer the same arrival pattern.
  let state = o.seed ?? 12345;
  const uniform = () => ((state = (Math.imul(state, 1103515245) + 12345) >>> 0) + 0.5) / 2 ** 32;
  const latencies: number[] = [];
  let errors = 0;
  const pending: Promise<void>[] = [];
  const start = performance.now();
  let arrival = 0;
  let n = 0;
  while (arrival < o.seconds * 1000) {
    arrival += (-Math.log(uniform()) * 1000) / o.rate;
    const due = start + arrival;
    const wait = due - performance.now();
    if (wait > 1) await new Promise((r) => setTimeout(r, wait));
    const cookie = o.cookies[n++ % o.cookies.length]!;
    pending.push(
      new Promise<void>((resolve) => {
        const req = request({ host: url.hostname, port: url.port, path: o.path, agent, headers: { cookie } }, (res) => {
          res.resume();
          res.on('end', () => {
            latencies.push(performance.now() - due);
            if (res.statusCode !== 200) errors++;
            resolve();
          });
        });
        req.on('error', () => (errors++, resolve()));
        req.end();
      }),
    );
  }
  await Promise.all(pending);
  agent.destroy();
  const elapsed = (performance.now() - start) / 1000;
  latencies.sort((a, b) => a - b);
  const at = (q: number) => Math.round(latencies[Math.min(latencies.length - 1, Math.floor(q * latencies.length))] ?? NaN);
  return { requestsPerSecond: Math.round(pending.length / elapsed), p50Ms: at(0.5), p99Ms: at(0.99), maxMs: at(1), errors, sent: pending.length };
}

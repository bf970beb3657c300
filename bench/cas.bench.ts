/**
 * Benchmark of the computation core (not a timed test): a fixed set of
 * statements, numeric n = 1..8 and symbolic n = 1..3, each evaluated repeatedly;
 * prints the median and 95th percentile in milliseconds per statement kind.
 */
import { evaluateWorksheet } from '../cas/index.js';

/** A fixed numeric complex symmetric matrix with positive definite real part. */
function numericIntegral(n: number): string {
  const x = (k: number) => `x${k + 1}`;
  const terms: string[] = [];
  for (let r = 0; r < n; r++) for (let c = r; c < n; c++) {
    const re = r === c ? (1.25 + 0.1 * r).toFixed(4) : (0.07 * Math.sin(r + 2 * c)).toFixed(4);
    const im = (0.6 * Math.cos(3 * r + c)).toFixed(4);
    const coef = `(${re} + ${im}*i)`;
    terms.push(r === c ? `${coef}*${x(r)}^2/2` : `${coef}*${x(r)}*${x(c)}`);
  }
  const source = Array.from({ length: n }, (_, k) => `(0.${k + 1} - 0.2*i)*${x(k)}`).join(' + ');
  return `integral N${n} = exp(-(${terms.join(' + ')}) + ${source}) d(${Array.from({ length: n }, (_, k) => x(k)).join(', ')})`;
}

const SYMBOLIC: Record<number, string> = {
  1: 'integral S1 = exp(-p^2*x^2 + q*x) d(x)',
  2: 'integral S2 = exp(-(k*a^2 + 2*i*lam*a*b + k*b^2)/2) d(a, b)',
  3: 'integral S3 = exp(-(k*(x^2 + y^2 + z^2) + 2*i*lam*(x*y + y*z))/2 + q*z) d(x, y, z)',
};
const PARAMS = 'param k : positive\nparam lam : real\nparam p : positive\nparam q : complex';

function percentile(xs: number[], p: number): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.ceil(p * s.length) - 1)]!;
}

/** Time statement `index` of a worksheet by the onStatementStart hook of the next statement. */
function timeStatement(source: string, index: number, runs: number): number[] {
  const out: number[] = [];
  evaluateWorksheet(source); // warm-up: module loading and JIT are not part of a statement's cost
  for (let r = 0; r < runs; r++) {
    let start = 0;
    const t0 = performance.now();
    evaluateWorksheet(source, { onStatementStart: (i) => { if (i === index) start = performance.now(); } });
    out.push(performance.now() - (start || t0));
  }
  return out;
}

const rows: [string, number[]][] = [];
for (let n = 1; n <= 8; n++) rows.push([`integral, numeric, n = ${n}`, timeStatement(numericIntegral(n), 0, 40)]);
const paramCount = PARAMS.split('\n').length;
for (let n = 1; n <= 3; n++) rows.push([`integral, symbolic, n = ${n}`, timeStatement(`${PARAMS}\n${SYMBOLIC[n]}`, paramCount, 15)]);
rows.push(['expect, symbolic n = 2', timeStatement(`${PARAMS}\n${SYMBOLIC[2]}\nexpect S2 = 2*pi/sqrt(k^2 + lam^2)`, paramCount + 1, 15)]);
rows.push(['param', timeStatement(PARAMS, 0, 40)]);

const width = Math.max(...rows.map(([k]) => k.length));
console.log(`${'statement'.padEnd(width)}  median ms   p95 ms   runs`);
for (const [kind, xs] of rows) {
  console.log(`${kind.padEnd(width)}  ${percentile(xs, 0.5).toFixed(2).padStart(9)}  ${percentile(xs, 0.95).toFixed(2).padStart(7)}  ${String(xs.length).padStart(5)}`);
}

// The parser's time against bracket depth and worksheet size (a benchmark, never a
// test), and what the server's own limits check still costs the event loop now that
// the parse runs in the evaluation worker: a single pass over the characters.
import { parseWorksheet } from '../cas/index.js';
import { checkEvaluationLimits } from '../server/evaluation/limits.js';
import { LIMITS } from '../shared/api.js';

const best = (f: () => void, runs = 5) => {
  let min = Infinity;
  for (let i = 0; i < runs; i++) {
    const t = performance.now();
    f();
    min = Math.min(min, performance.now() - t);
  }
  return Math.round(min * 100) / 100;
};

const depth: Record<string, number> = {};
for (const d of [16, 20, 23, 32, LIMITS.expressionDepth]) {
  const line = `let F = ${'('.repeat(d)}k${')'.repeat(d)}`;
  depth[`depth${d}`] = best(() => parseWorksheet(line));
}
// a worksheet at the size limit: many ordinary statements
const statement = `let F = ${Array.from({ length: 40 }, (_, j) => `(k*x^2 + ${j}*i*g*x*y)/${j + 2}`).join(' + ')}`;
const lines: string[] = ['param k : positive', 'param g : real'];
while (lines.join('\n').length + statement.length + 1 < LIMITS.worksheetBytes && lines.length < LIMITS.statementsPerWorksheet) lines.push(statement);
const big = lines.join('\n');
const deepLines = Array.from({ length: 300 }, () => `let F = ${'('.repeat(LIMITS.expressionDepth)}k${')'.repeat(LIMITS.expressionDepth)}`).join('\n');
const result = {
  parseMsByBracketDepth: depth,
  parseLargeMs: best(() => parseWorksheet(big)),
  parseDeepLinesMs: best(() => parseWorksheet(deepLines)),
  serverLimitsCheckLargeMs: best(() => checkEvaluationLimits(big)),
  worksheetKB: Math.round(big.length / 1024),
};
console.log(`parse by bracket depth (ms): ${Object.entries(depth).map(([k, v]) => `${k.slice(5)}: ${v}`).join(', ')}`);
console.log(`parse a ${result.worksheetKB} kB worksheet: ${result.parseLargeMs} ms (in the worker); 300 lines at depth ${LIMITS.expressionDepth}: ${result.parseDeepLinesMs} ms`);
console.log(`server-side limits check (event loop) on it: ${result.serverLimitsCheckLargeMs} ms`);
console.log(`BENCH_JSON ${JSON.stringify({ parser: result })}`);

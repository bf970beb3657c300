// Incremental evaluation (server/evaluation/reuse.ts): after an edit only the statements
// whose key changed are computed again, and every report equals a fresh run's. The pool
// is used directly; speed is measured by bench/keystroke.bench.ts.
import assert from 'node:assert/strict';
import { after, test } from 'node:test';
import { EvaluationPool } from '../../server/evaluation/pool.js';
import { DEMO_WORKSHEETS } from '../../server/db/seeders/demo-data.js';
import type { WorksheetReport } from '../../shared/evaluation.js';

const reusing = new EvaluationPool({ size: 1, timeLimitMsPerStatement: 5000, reuse: true });
const fresh = new EvaluationPool({ size: 1, timeLimitMsPerStatement: 5000, reuse: false });
after(async () => {
  await reusing.close();
  await fresh.close();
});

const BASE = `param k : positive
param g : real
integral Z = exp(-(k*x^2 + 2*i*g*x*y + k*y^2)/2) d(x, y)
expect Z = 2*pi/sqrt(k^2 + g^2)
let R = Z*k
integral N = exp(-x^2/2) d(x)
`;

/** Evaluates `source` with reuse (as one owner) and fresh; asserts the two reports are the same; says what was computed. */
async function both(source: string, owner = 'user:1'): Promise<{ started: number; reused: number; report: WorksheetReport }> {
  const started0 = reusing.statementsStarted;
  const reused0 = reusing.statementsReused;
  const report = await reusing.evaluate(source, { owner });
  const started = reusing.statementsStarted - started0;
  const reused = reusing.statementsReused - reused0;
  const expected = await fresh.evaluate(source, { owner });
  // measured times (timeMs) differ between any two runs
  const timeless = (r: WorksheetReport) => JSON.parse(JSON.stringify(r, (k, v) => (k === 'timeMs' ? undefined : v)));
  assert.deepEqual(timeless(report), timeless(expected), `the report with ${reused} kept records differs from a fresh run of:\n${source}`);
  return { started, reused, report };
}

test('an added statement is the only one computed; the rest is kept as it was', async () => {
  const first = await both(BASE);
  assert.equal(first.reused, 0);
  const okCount = first.report.statements.filter((s) => s.status === 'ok').length;
  const added = await both(BASE + 'integral W = exp(-3*q^2/2) d(q)\n');
  assert.equal(added.started, 1);
  assert.equal(added.reused, okCount);
});

test('a changed definition computes its dependants again, and only them', async () => {
  await both(BASE);
  const changed = await both(BASE.replace('let R = Z*k', 'let R = Z*k^2'));
  assert.equal(changed.started, 1, 'only the let');
  const domain = await both(BASE.replace('param g : real', 'param g : positive'));
  // g's domain changes Z, its expect and R (and N, which follows a param line: params are part of every key after them)
  assert.ok(domain.started >= 3, `started ${domain.started}`);
});

test('a line inserted above moves every statement below it: they are computed again, with their new line numbers', async () => {
  await both(BASE);
  const moved = await both(`# a comment\n${BASE}`);
  assert.equal(moved.reused, 0);
  assert.equal(moved.report.statements[0]!.line, 2);
});

test('errors are not kept; a statement using a name defined later is not taken from a run where it was defined earlier', async () => {
  const broken = `param k : positive\nintegral A = exp(-k*x^2/2) d(x)\nlet B = A*undefinedName\n`;
  await both(broken);
  const again = await both(broken + 'let C = A\n');
  assert.ok(again.report.statements.some((s) => s.status === 'error'));
  const swapped = `param k : positive\nlet B = A\nintegral A = exp(-k*x^2/2) d(x)\n`;
  await both(swapped);
});

test('edits of every demo worksheet give the same report as a fresh run', async () => {
  for (const { source } of DEMO_WORKSHEETS) {
    const owner = `user:demo-${source.length}`;
    const lines = source.split('\n');
    await both(source, owner);
    await both(source + '\nintegral Wextra = exp(-2*q^2/2) d(q)\n', owner);
    // drop the last statement line, then change the first param line's domain
    const last = lines.map((l, i) => [l, i] as const).filter(([l]) => /^\s*(integral|let|expect|verify|compare|limit|moment|derivative|continue|rotate)\b/.test(l)).pop();
    if (last) await both(lines.filter((_, i) => i !== last[1]).join('\n'), owner);
    await both(source.replace(/param (\w+) : positive/, 'param $1 : real'), owner);
  }
});

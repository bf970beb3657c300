/** Parser: plain error sentences at the right line and column; a fuzz run that never crashes or hangs. */
import { test } from 'node:test';
import assert from 'node:assert/strict';
import fc from 'fast-check';
import { spawnSync } from 'node:child_process';
import { parseWorksheet } from '../../cas/index.js';

const GOOD = [
  'param k : positive', 'param lam : real', 'integral Z = exp(-(k*a^2 + 2*i*lam*a*b + k*b^2)/2) d(a, b)',
  'expect Z = 2*pi/sqrt(k^2 + lam^2)', 'note "kept with the record"', '# a comment',
].join('\n');

const lines3 = () => GOOD.split('\n')[2]!;

const CASES: { src: string; line: number; column: number; says: RegExp }[] = [
  { src: 'param k : realish', line: 1, column: 11, says: /Expected a domain \(positive, negative, real, complex or nonzero\), but found "realish"/ },
  { src: 'param k positive', line: 1, column: 9, says: /Expected ":"|Expected .*":"/ },
  { src: 'param k : positive\nintegral W = exp(-k*x^2 d(x)', line: 2, column: 25, says: /closing parenthesis/ },
  { src: 'integral = exp(-x^2) d(x)', line: 1, column: 10, says: /Expected a name, but found "="/ },
  { src: 'integrl Z = exp(-x^2) d(x)', line: 1, column: 1, says: /A statement starts with one of param, integral/ },
  { src: 'integral Q = exp(-2x^2) d(x)', line: 1, column: 20, says: /Write a product with "\*"/ },
  { src: 'integral Q = exp(-x^2) d(x y)', line: 1, column: 28, says: /Expected a comma, ":" or a closing parenthesis/ },
  { src: 'integral Q = exp(-x^2)', line: 1, column: 23, says: /integration variables, written d\(x, y, \.\.\.\)/ },
  { src: 'integral Q = gamma(x) d(x)', line: 1, column: 14, says: /"gamma" is not a known function/ },
  { src: '\n\nexpect Z = ', line: 3, column: 12, says: /Expected an expression, but found the end of the line/ },
  { src: 'param 3 : real', line: 1, column: 7, says: /Expected a name, but found "3"/ },
  { src: 'note "never closed', line: 1, column: 6, says: /text in double quotes/ },
  { src: 'param pi : real', line: 1, column: 7, says: /"pi" is a reserved word/ },
  { src: 'integral Q = exp(-x^2) d(x, x)', line: 1, column: 29, says: /listed twice/ },
  { src: 'expect Z = 2 ** 3', line: 1, column: 15, says: /Expected an expression/ },
];

for (const c of CASES) {
  test(`parse error: ${JSON.stringify(c.src)}`, () => {
    const r = parseWorksheet(c.src);
    assert.equal(r.errors.length, 1, JSON.stringify(r.errors));
    const e = r.errors[0]!;
    assert.match(e.message, c.says);
    assert.equal(e.line, c.line, e.message);
    assert.equal(e.column, c.column, e.message);
    assert.match(e.message, /^[A-Z"`].*\.$/, 'a plain sentence');
  });
}

test('a good worksheet parses with spans; a bad line does not hide the others', () => {
  const r = parseWorksheet(GOOD);
  assert.deepEqual(r.errors, []);
  assert.deepEqual(r.lines.map((l) => l.line), [1, 2, 3, 4, 5]);
  const bad = parseWorksheet(`${GOOD}\nparam q :: real\nparam m : positive`);
  assert.equal(bad.errors.length, 1);
  assert.equal(bad.lines.filter((l) => l.ok).length, 6);
  const integral = r.lines[2]!;
  assert.ok(integral.ok && integral.statement.kind === 'integral');
  if (integral.ok && integral.statement.kind === 'integral') {
    const text = lines3();
    const at = text.indexOf('d(a, b)');
    assert.deepEqual(integral.statement.vars.map((v) => [v.name, v.span.start.column]), [['a', at + 3], ['b', at + 6]]);
  }
});

test('fuzz: 2,000 random and mutated worksheets never crash or hang, and every error is located inside the text', () => {
  const lines = GOOD.split('\n');
  const alphabet = fc.constantFrom(...'paramintegralexpectnote dxyk()=+-*/^:,."#0123456789i\n\t'.split(''));
  const random = fc.array(alphabet, { maxLength: 120 }).map((cs) => cs.join(''));
  const mutated = fc.record({
    at: fc.nat(), del: fc.nat({ max: 6 }), ins: fc.string({ maxLength: 8 }), line: fc.nat({ max: lines.length - 1 }),
  }).map(({ at, del, ins, line }) => {
    const l = lines[line]!;
    const k = at % (l.length + 1);
    return lines.map((x, j) => (j === line ? x.slice(0, k) + ins + x.slice(k + del) : x)).join('\n');
  });
  let count = 0;
  fc.assert(fc.property(fc.oneof(random, mutated, fc.string({ maxLength: 200 })), (src) => {
    count++;
    const t = performance.now();
    const r = parseWorksheet(src);
    assert.ok(performance.now() - t < 500, 'parsing took too long');
    const nLines = src.split(/\r?\n/).length;
    for (const e of r.errors) {
      assert.ok(e.line >= 1 && e.line <= nLines, `line ${e.line}`);
      assert.ok(e.column >= 1, `column ${e.column}`);
      assert.ok(e.message.length > 10);
    }
  }), { numRuns: 2000, seed: 2024 });
  assert.equal(count, 2000);
});

test('the parser compiled ahead of time is current with cas/lang/line.peggy', () => {
  const r = spawnSync(process.execPath, ['scripts/build-grammar.mjs', '--check'], { encoding: 'utf8' });
  assert.equal(r.status, 0, r.stderr);
});

test('parsing is linear in bracket depth: depth 64 (the limit) parses at once, and d and e are ordinary names', () => {
  const deep = `let F = ${'('.repeat(64)}1${')'.repeat(64)}^2`;
  const r = parseWorksheet(`param d, e : positive\nintegral Z = exp(-d*e*x^2) d(x)\n${deep}`);
  assert.deepEqual(r.errors, []);
  const z = r.lines[1]!;
  assert.ok(z.ok && z.statement.kind === 'integral' && z.statement.vars.map((v) => v.name).join() === 'x');
});

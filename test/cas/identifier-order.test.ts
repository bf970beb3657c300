/**
 * identifierOrder must give the order localeCompare gives (printed sums order their terms
 * by it); checked against Node's own localeCompare (ICU, the general-purpose library here)
 * on random names, with the corners spelled out.
 */
import { test } from 'node:test';
import assert from 'node:assert/strict';
import fc from 'fast-check';
import { identifierOrder } from '../../cas/expr/identifierOrder.js';

const name = fc.stringMatching(/^[A-Za-z0-9_]{0,6}$/);
const sign = (x: number) => Math.sign(x);

test('identifierOrder agrees with localeCompare on names of letters, digits and underscores', () => {
  fc.assert(fc.property(name, name, (a, b) => sign(identifierOrder(a, b)) === sign(a.localeCompare(b))), { numRuns: 20_000 });
});

test('identifierOrder: the corners of the collation', () => {
  const pairs: [string, string][] = [['_', '0'], ['9', 'a'], ['a', 'B'], ['ab', 'Aa'], ['aB', 'Ab'], ['a', 'A'], ['a1', 'a_'], ['x10', 'x2'], ['ab', 'a'], ['L2', 'w2'], ['k2lam1', 'K2lam1']];
  for (const [a, b] of pairs) {
    assert.equal(sign(identifierOrder(a, b)), sign(a.localeCompare(b)), `${a} against ${b}`);
    assert.equal(sign(identifierOrder(b, a)), sign(b.localeCompare(a)), `${b} against ${a}`);
  }
  assert.deepEqual(['b', 'B', 'a_1', 'a1', 'A', 'a'].sort(identifierOrder), ['a', 'A', 'a_1', 'a1', 'b', 'B']);
});

test('identifierOrder leaves other names to localeCompare', () => {
  assert.equal(sign(identifierOrder('é', 'f')), sign('é'.localeCompare('f')));
  assert.equal(sign(identifierOrder('a-b', 'a_b')), sign('a-b'.localeCompare('a_b')));
});

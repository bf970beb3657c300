/**
 * The inverse of a square matrix of rational functions, exactly, by Gauss-Jordan elimination
 * in the field of rational functions (pivoting on the first entry that is not identically
 * zero). Null when the matrix is singular as a matrix of rational functions.
 *
 * Example: inverseRat([[k, 0], [0, 2]]) is [[1/k, 0], [0, 1/2]].
 */
import { rfDiv, rfIsZero, rfMul, rfSub, RF0, RF1, type RatFunc } from './ratfunc.js';

export function inverseRat(m: readonly (readonly RatFunc[])[]): RatFunc[][] | null {
  const n = m.length;
  const a = m.map((row, r) => [...row, ...Array.from({ length: n }, (_, c) => (c === r ? RF1 : RF0))]);
  for (let col = 0; col < n; col++) {
    const p = a.findIndex((row, r) => r >= col && !rfIsZero(row[col]!));
    if (p < 0) return null;
    [a[col], a[p]] = [a[p]!, a[col]!];
    const pivot = a[col]![col]!;
    a[col] = a[col]!.map((x) => rfDiv(x, pivot));
    for (let r = 0; r < n; r++) {
      if (r === col || rfIsZero(a[r]![col]!)) continue;
      const f = a[r]![col]!;
      a[r] = a[r]!.map((x, c) => rfSub(x, rfMul(f, a[col]![c]!)));
    }
  }
  return a.map((row) => row.slice(n));
}

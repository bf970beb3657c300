/**
 * Whether a real symmetric matrix is positive definite, by Cholesky factorization:
 * it is exactly when every pivot is positive (a textbook fact, e.g. Golub & Van Loan
 * §4.2, from memory). About n^3/6 operations, against the ~10 n^3 of a symmetric
 * eigenvalue computation, so large matrices are decided this way.
 *
 * Returns the smallest pivot, or null when some pivot is not above `tolerance`.
 */
export function smallestCholeskyPivot(a: Float64Array, n: number, tolerance: number): number | null {
  const l = new Float64Array(a);
  let smallest = Infinity;
  for (let j = 0; j < n; j++) {
    let d = l[j * n + j]!;
    for (let k = 0; k < j; k++) d -= l[j * n + k]! ** 2;
    if (!(d > tolerance)) return null;
    smallest = Math.min(smallest, d);
    const root = Math.sqrt(d);
    l[j * n + j] = root;
    for (let i = j + 1; i < n; i++) {
      let s = l[i * n + j]!;
      for (let k = 0; k < j; k++) s -= l[i * n + k]! * l[j * n + k]!;
      l[i * n + j] = s / root;
    }
  }
  return smallest;
}

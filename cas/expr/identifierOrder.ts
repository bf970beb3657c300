/**
 * The order String.prototype.localeCompare gives to names made of ASCII letters, digits
 * and underscores (Unicode's root collation: '_' before digits before letters, letters
 * compared without case first, then lower case before upper case at the first place the
 * case differs), without it: its first call loads the collation data, ~11 ms of a
 * command-line run on this machine. Other strings go to localeCompare itself.
 * Printed sums order their terms by it (fromExact.ts), so it must not change that order:
 * a property test compares the two (test/cas/identifier-order.test.ts).
 *
 * Example: ['b', 'B', 'a_1', 'a1', 'A', 'a'].sort(identifierOrder) is ['a', 'A', 'a_1', 'a1', 'b', 'B'].
 */
const PLAIN = /^[A-Za-z0-9_]*$/;

/** Primary weight: '_' 0, digits 1-10, letters 11-36 whatever their case. */
function primary(code: number): number {
  if (code === 95) return 0;
  if (code <= 57) return code - 47;
  return (code | 32) - 86;
}

export function identifierOrder(a: string, b: string): number {
  if (!PLAIN.test(a) || !PLAIN.test(b)) return a.localeCompare(b);
  const n = Math.min(a.length, b.length);
  for (let k = 0; k < n; k++) {
    const d = primary(a.charCodeAt(k)) - primary(b.charCodeAt(k));
    if (d !== 0) return d < 0 ? -1 : 1;
  }
  if (a.length !== b.length) return a.length < b.length ? -1 : 1;
  for (let k = 0; k < n; k++) {
    if (a[k] !== b[k]) return a.charCodeAt(k) >= 97 ? -1 : 1; // they differ only in case here: lower case first
  }
  return 0;
}

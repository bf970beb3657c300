/**
 * Symbolic convergence rules that settle common cases exactly: Sylvester's
 * criterion on Re A with minors of provable sign, Re A = 0 with a provably
 * nonzero det(Im A), or a diagonal entry of Re A that is provably negative.
 */
import type { Domain } from '../../shared/evaluation.js';
import type { Expr } from '../lang/ast.js';
import { add, div, mul, neg, num, pow, product, I, name as nameExpr, PI } from '../expr/build.js';
import { imagPart, ldet, provedSign, realPart, toLaurent, type Laurent } from '../domains/laurent.js';
import type { Q } from '../domains/rational.js';

export type ProofOutcome =
  | { kind: 'absolute'; reason: string; minors: Expr[] }
  | { kind: 'oscillatory'; reason: string; detB: Expr }
  | { kind: 'divergent'; reason: string; direction: number[] };

function qExpr(x: Q): Expr {
  const n = x.n < 0n ? -x.n : x.n;
  const e = x.d === 1n ? num(n.toString()) : div(num(n.toString()), num(x.d.toString()));
  return x.n < 0n ? neg(e) : e;
}

/** A Laurent polynomial as an expression, for the record. */
export function laurentExpr(a: Laurent): Expr {
  let acc: Expr = num(0);
  for (const t of a.values()) {
    const factors: Expr[] = [];
    for (const [n, e] of t.exps) {
      const base = n === '%pi' ? PI : n === '%e' ? { t: 'const', name: 'e' } as Expr : nameExpr(n);
      factors.push(e === 1 ? base : pow(base, num(e)));
    }
    const re = t.c.re.n !== 0n ? qExpr(t.c.re) : null;
    const im = t.c.im.n !== 0n ? mul(qExpr(t.c.im), I) : null;
    const coeff = re && im ? add(re, im) : (re ?? im ?? num(0));
    acc = add(acc, mul(coeff, product(factors)));
  }
  return acc;
}

export function proveConvergence(A: readonly (readonly Expr[])[], domains: ReadonlyMap<string, Domain>): ProofOutcome | null {
  const n = A.length;
  if (n > 4) return null;
  const L: Laurent[][] = [];
  for (const row of A) {
    const r: Laurent[] = [];
    for (const e of row) { const l = toLaurent(e, domains); if (!l) return null; r.push(l); }
    L.push(r);
  }
  const re = L.map((row) => row.map(realPart));
  const minors: Laurent[] = [];
  let allPositive = true;
  for (let k = 1; k <= n; k++) {
    const m = ldet(re.slice(0, k).map((row) => row.slice(0, k)));
    minors.push(m);
    if (provedSign(m, domains) !== 1) { allPositive = false; break; }
  }
  if (allPositive) {
    return {
      kind: 'absolute',
      reason: `Re A is positive definite on the whole domain: its leading principal minors are sums of terms that are positive under the declared domains (Sylvester's criterion).`,
      minors: minors.map(laurentExpr),
    };
  }
  for (let j = 0; j < n; j++) {
    if (provedSign(re[j]![j]!, domains) === -1) {
      return {
        kind: 'divergent',
        reason: `The diagonal entry Re A_${j + 1}${j + 1} is negative on the whole domain, so the integrand grows along the x_${j + 1} axis.`,
        direction: Array.from({ length: n }, (_, k) => (k === j ? 1 : 0)),
      };
    }
  }
  if (re.every((row) => row.every((x) => x.size === 0))) {
    const detB = ldet(L.map((row) => row.map((x) => imagPart(x))));
    const s = provedSign(detB, domains);
    const monomialNonzero = detB.size === 1 && [...detB.values()].every((t) => [...t.exps.keys()].every((v) => {
      const d = v.startsWith('%') ? 'positive' : domains.get(v);
      return d === 'positive' || d === 'negative' || d === 'nonzero';
    }));
    if (s === 1 || s === -1 || monomialNonzero) {
      return {
        kind: 'oscillatory',
        reason: 'Re A vanishes identically and det(Im A) is nonzero on the whole domain: an oscillatory integral, defined as the limit of A + epsilon*I as epsilon -> 0+.',
        detB: laurentExpr(detB),
      };
    }
  }
  return null;
}

/**
 * Expansion of an exponent into monomials in the integration variables, with
 * coefficients left as expressions in the parameters. This is the structural
 * route to A, J and c; the algebra adapter's derivatives are checked against it.
 */
import { Complex } from 'complex.js';
import type { Expr } from '../lang/ast.js';
import { add, div, mul, neg, num } from '../expr/build.js';
import { evaluate } from '../expr/evaluate.js';
import { dependsOn, freeNames } from '../expr/names.js';
import type { Point } from '../domains/sample.js';

export type Monomial = number[];
export type Poly = Map<string, { exps: Monomial; coeff: Expr }>;

export class NotPolynomial extends Error {
  constructor(message: string, readonly variable: string) { super(message); }
}

/** Larger powers are refused before expansion, so a huge exponent cannot blow up. */
const MAX_DEGREE = 12;

const key = (m: Monomial) => m.join(',');
const degreeOf = (m: Monomial) => m.reduce((s, d) => s + d, 0);

function constant(n: number, e: Expr): Poly { return new Map([[key(new Array<number>(n).fill(0)), { exps: new Array<number>(n).fill(0), coeff: e }]]); }

function plus(p: Poly, q: Poly, sign: 1 | -1): Poly {
  const out: Poly = new Map(p);
  for (const [k, t] of q) {
    const prev = out.get(k);
    const c = sign < 0 ? neg(t.coeff) : t.coeff;
    out.set(k, { exps: t.exps, coeff: prev ? add(prev.coeff, c) : c });
  }
  return out;
}

function times(p: Poly, q: Poly, vars: readonly string[]): Poly {
  const out: Poly = new Map();
  for (const a of p.values()) for (const b of q.values()) {
    const exps = a.exps.map((d, j) => d + b.exps[j]!);
    if (degreeOf(exps) > MAX_DEGREE) {
      const j = exps.indexOf(Math.max(...exps));
      throw new NotPolynomial(`The exponent has degree above ${MAX_DEGREE} in ${vars[j]}; a Gaussian integral needs degree at most 2.`, vars[j]!);
    }
    const k = key(exps);
    const prev = out.get(k);
    const c = mul(a.coeff, b.coeff);
    out.set(k, { exps, coeff: prev ? add(prev.coeff, c) : c });
  }
  return out;
}

function integerValue(e: Expr): number | null {
  if (freeNames(e).size > 0) return null;
  try {
    const v = evaluate(e, new Map());
    return v.im === 0 && Number.isInteger(v.re) ? v.re : null;
  } catch { return null; }
}

function where(e: Expr, vars: ReadonlySet<string>): string {
  for (const n of freeNames(e).keys()) if (vars.has(n)) return n;
  return '?';
}

export function expand(e: Expr, vars: readonly string[]): Poly {
  const set = new Set(vars);
  const n = vars.length;
  const go = (x: Expr): Poly => {
    if (!dependsOn(x, set)) return constant(n, x);
    switch (x.t) {
      case 'name': {
        const exps = vars.map((v) => (v === x.name ? 1 : 0));
        return new Map([[key(exps), { exps, coeff: num(1) }]]);
      }
      case 'neg': return plus(new Map(), go(x.a), -1);
      case 'bin':
        switch (x.op) {
          case '+': return plus(go(x.a), go(x.b), 1);
          case '-': return plus(go(x.a), go(x.b), -1);
          case '*': return times(go(x.a), go(x.b), vars);
          case '/': {
            if (dependsOn(x.b, set)) {
              const v = where(x.b, set);
              throw new NotPolynomial(`The exponent is not a polynomial in ${v}: ${v} appears in a denominator.`, v);
            }
            const p = go(x.a);
            const out: Poly = new Map();
            for (const [k, t] of p) out.set(k, { exps: t.exps, coeff: div(t.coeff, x.b) });
            return out;
          }
          case '^': {
            const v = where(x, set);
            if (dependsOn(x.b, set)) throw new NotPolynomial(`The exponent is not a polynomial in ${v}: ${v} appears in a power's exponent.`, v);
            const k = integerValue(x.b);
            if (k === null || k < 0) throw new NotPolynomial(`The exponent is not a polynomial in ${v}: ${v} is raised to a power that is not a whole number 0, 1, 2, ...`, v);
            if (k > MAX_DEGREE) throw new NotPolynomial(`The exponent has degree ${k} in ${v}; a Gaussian integral needs degree at most 2.`, v);
            let acc = constant(n, num(1));
            const base = go(x.a);
            for (let j = 0; j < k; j++) acc = times(acc, base, vars);
            return acc;
          }
        }
      // falls through: every operator returned above
      case 'call': {
        const v = where(x, set);
        throw new NotPolynomial(`The exponent is not a polynomial in ${v}: ${v} appears inside ${x.t === 'call' ? x.fn : 'a function'}.`, v);
      }
      default: return constant(n, x);
    }
  };
  return go(e);
}

/** Value and a bound on the size of the summands, so that a cancellation to zero is recognised in floating point. */
function valueAndBound(e: Expr, p: Point): [Complex, number] {
  switch (e.t) {
    case 'bin':
      if (e.op === '+' || e.op === '-' || e.op === '*') {
        const [a, ba] = valueAndBound(e.a, p);
        const [b, bb] = valueAndBound(e.b, p);
        if (e.op === '*') return [a.mul(b), ba * bb];
        return [e.op === '+' ? a.add(b) : a.sub(b), ba + bb];
      }
      break;
    case 'neg': { const [a, ba] = valueAndBound(e.a, p); return [a.neg(), ba]; }
    default: break;
  }
  const v = evaluate(e, p);
  return [v, v.abs()];
}

/** Zero at every point, up to rounding of its own summands (identity testing by evaluation). */
export function vanishes(e: Expr, points: readonly Point[]): boolean {
  for (const p of points) {
    const [v, bound] = valueAndBound(e, p);
    if (!(v.abs() <= 1e-11 * Math.max(bound, 1e-300))) return false;
  }
  return true;
}

/** The monomials that do not vanish identically. */
export function prune(p: Poly, points: readonly Point[]): Poly {
  const out: Poly = new Map();
  for (const [k, t] of p) if (!vanishes(t.coeff, points)) out.set(k, t);
  return out;
}

export function totalDegree(p: Poly): { degree: number; exps: Monomial | null } {
  let best = { degree: 0, exps: null as Monomial | null };
  for (const t of p.values()) {
    const d = degreeOf(t.exps);
    if (d > best.degree) best = { degree: d, exps: t.exps };
  }
  return best;
}

/** Numeric evaluation of an expression in complex double precision, principal branches throughout. */
import { Complex } from 'complex.js';
import type { Expr } from '../lang/ast.js';

export type Env = ReadonlyMap<string, Complex>;

const FN: Record<string, (z: Complex) => Complex> = {
  exp: (z) => z.exp(),
  sqrt: (z) => z.sqrt(),
  log: (z) => z.log(),
  sin: (z) => z.sin(),
  cos: (z) => z.cos(),
  sinh: (z) => z.sinh(),
  cosh: (z) => z.cosh(),
  abs: (z) => new Complex(z.abs(), 0),
  conj: (z) => z.conjugate(),
};

/** z^w with an exact integer power by repeated multiplication (complex.js pow goes through log). */
function power(z: Complex, w: Complex): Complex {
  if (w.im === 0 && Number.isInteger(w.re) && Math.abs(w.re) <= 64) {
    let r = new Complex(1, 0);
    for (let k = 0; k < Math.abs(w.re); k++) r = r.mul(z);
    return w.re < 0 ? new Complex(1, 0).div(r) : r;
  }
  if (w.im === 0 && w.re === 0.5) return z.sqrt();
  if (w.im === 0 && w.re === -0.5) return new Complex(1, 0).div(z.sqrt());
  if (z.re === 0 && z.im === 0) return new Complex(0, 0);
  return z.pow(w);
}

export function evaluate(e: Expr, env: Env): Complex {
  switch (e.t) {
    case 'num': return new Complex(Number(e.v), 0);
    case 'const': return e.name === 'i' ? new Complex(0, 1) : new Complex(e.name === 'pi' ? Math.PI : Math.E, 0);
    case 'name': {
      const v = env.get(e.name);
      if (v === undefined) throw new Error(`No value for "${e.name}".`);
      return v;
    }
    case 'neg': return evaluate(e.a, env).neg();
    case 'bin': {
      const a = evaluate(e.a, env);
      const b = evaluate(e.b, env);
      switch (e.op) {
        case '+': return a.add(b);
        case '-': return a.sub(b);
        case '*': return a.mul(b);
        case '/': return a.div(b);
        case '^': return e.a.t === 'const' && e.a.name === 'e' ? b.exp() : power(a, b);
      }
    }
    // falls through: the switch above returns for every operator
    case 'call': {
      const f = FN[e.fn];
      if (!f) throw new Error(`Unknown function ${e.fn}.`);
      return f(evaluate(e.args[0]!, env));
    }
  }
}

/** Relative distance |a - b| / max(|a|, |b|, floor). */
export function relDiff(a: Complex, b: Complex, floor = 1e-300): number {
  const d = a.sub(b).abs();
  return d / Math.max(a.abs(), b.abs(), floor);
}

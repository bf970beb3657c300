/** Numeric evaluation of an expression in complex double precision, principal branches throughout. */
import { Complex } from 'complex.js';
import type { Expr } from '../lang/ast.js';
import { etaValue } from '../numeric/lattice.js';

export type Env = ReadonlyMap<string, Complex>;

const FN: Record<string, (z: Complex) => Complex> = {
  exp: (z) => z.exp(),
  sqrt: (z) => z.sqrt(),
  log: (z) => z.log(),
  sin: (z) => z.sin(),
  cos: (z) => z.cos(),
  sinh: (z) => z.sinh(),
  cosh: (z) => z.cosh(),
  asinh: (z) => z.asinh(),
  abs: (z) => new Complex(z.abs(), 0),
  conj: (z) => z.conjugate(),
  Gamma: (z) => gammaComplex(z),
  eta: (z) => etaValue(z),
};

/** Lanczos coefficients (g = 7, n = 9): about 15 digits in the right half plane. */
const LANCZOS = [0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059,
  12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6, 1.5056327351493116e-7];

/** Euler's Gamma function for complex z by the Lanczos approximation, with reflection for Re z < 1/2; infinite at 0, -1, -2, ... */
export function gammaComplex(z: Complex): Complex {
  if (z.im === 0 && z.re <= 0 && Number.isInteger(z.re)) return new Complex(Infinity, 0);
  if (z.re < 0.5) {
    // Gamma(z) Gamma(1 - z) = pi / sin(pi z)
    return new Complex(Math.PI, 0).div(z.mul(Math.PI).sin().mul(gammaComplex(new Complex(1, 0).sub(z))));
  }
  const w = z.sub(1);
  let x = new Complex(LANCZOS[0]!, 0);
  for (let k = 1; k < LANCZOS.length; k++) x = x.add(new Complex(LANCZOS[k]!, 0).div(w.add(k)));
  const t = w.add(7.5);
  return new Complex(Math.sqrt(2 * Math.PI), 0).mul(t.pow(w.add(0.5))).mul(t.neg().exp()).mul(x);
}

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

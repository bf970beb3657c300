/**
 * Display normal form: what the algebra adapter hands back (x^(-1), e^x, (1/2)*y)
 * rewritten the way a physicist writes it (1/x, exp(x), y/2), before printing.
 */
import type { Expr } from '../lang/ast.js';
import { call, div, mul, neg, num, pow } from './build.js';

function numericValue(e: Expr): number | null {
  if (e.t === 'num') return Number(e.v);
  if (e.t === 'neg') { const v = numericValue(e.a); return v === null ? null : -v; }
  if (e.t === 'bin' && e.op === '/') {
    const a = numericValue(e.a); const b = numericValue(e.b);
    return a === null || b === null ? null : a / b;
  }
  return null;
}

interface Factors { sign: number; top: Expr[]; bottom: Expr[] }

/** Split a product/quotient into numerator and denominator factors, moving x^(-p) below the line. */
function collect(e: Expr, f: Factors, inverted: boolean): void {
  if (e.t === 'neg') { f.sign = -f.sign; collect(e.a, f, inverted); return; }
  if (e.t === 'bin' && e.op === '*') { collect(e.a, f, inverted); collect(e.b, f, inverted); return; }
  if (e.t === 'bin' && e.op === '/') { collect(e.a, f, inverted); collect(e.b, f, !inverted); return; }
  const t = tidy(e);
  if (t.t === 'bin' && t.op === '/' ) { collect(t, f, inverted); return; }
  if (t.t === 'neg') { collect(t, f, inverted); return; }
  if (t.t === 'num' && Number(t.v) === 1) return;
  (inverted ? f.bottom : f.top).push(t);
}

function tidyPower(base: Expr, exponent: Expr): Expr {
  const b = tidy(base);
  if (b.t === 'const' && b.name === 'e') return call('exp', tidy(exponent));
  const v = numericValue(exponent);
  if (v !== null) {
    if (v === 0.5) return call('sqrt', b);
    if (v < 0) return div(num(1), tidyPower(b, numFromValue(-v, exponent)));
    if (v === 1) return b;
  }
  return pow(b, tidy(exponent));
}

/** The positive counterpart of a negative numeric exponent, kept exact when it was a fraction. */
function numFromValue(v: number, _original: Expr): Expr {
  const [p, q] = rational(v);
  return q === 1 ? num(p) : div(num(p), num(q));
}

/** A small-denominator fraction p/q equal to v, or v itself over 1. */
export function rational(v: number): [number, number] {
  for (let q = 1; q <= 1000; q++) {
    const p = Math.round(v * q);
    if (Math.abs(p - v * q) < 1e-9 * Math.max(1, Math.abs(v * q))) return [p, q];
  }
  return [v, 1];
}

function gcd(a: number, b: number): number { return b === 0 ? Math.abs(a) : gcd(b, a % b); }

const ORDER = (x: Expr): number =>
  x.t === 'num' ? 0 : x.t === 'const' ? 1 : x.t === 'name' ? 2 : x.t === 'call' && x.fn === 'exp' ? 5 : x.t === 'call' ? 4 : 3;

/** Multiply the integer factors together, cancel them across the line, and sort the rest. */
function arrange(f: Factors): { top: Expr[]; bottom: Expr[] } {
  const isInt = (x: Expr) => x.t === 'num' && Number.isInteger(Number(x.v));
  let p = f.top.filter(isInt).reduce((a, x) => a * Number((x as { v: string }).v), 1);
  let q = f.bottom.filter(isInt).reduce((a, x) => a * Number((x as { v: string }).v), 1);
  if (Number.isSafeInteger(p) && Number.isSafeInteger(q) && p !== 0) { const g = gcd(p, q); p /= g; q /= g; }
  const sortRest = (xs: Expr[]) => xs.filter((x) => !isInt(x)).map((x, k) => [x, k] as const)
    .sort((a, b) => ORDER(a[0]) - ORDER(b[0]) || a[1] - b[1]).map(([x]) => x);
  return { top: [num(p), ...sortRest(f.top)], bottom: [num(q), ...sortRest(f.bottom)] };
}

export function tidy(e: Expr): Expr {
  switch (e.t) {
    case 'bin': {
      if (e.op === '^') return tidyPower(e.a, e.b);
      if (e.op === '*' || e.op === '/') {
        const f: Factors = { sign: 1, top: [], bottom: [] };
        collect(e, f, false);
        const arranged = arrange(f);
        const top = arranged.top.reduce<Expr>((p, x) => mul(p, x), num(1));
        const bottom = arranged.bottom.reduce<Expr>((p, x) => mul(p, x), num(1));
        const q = div(top, bottom);
        return f.sign < 0 ? neg(q) : q;
      }
      const a = tidy(e.a);
      const b = tidy(e.b);
      if (e.op === '+' && b.t === 'neg') return { t: 'bin', op: '-', a, b: b.a };
      if (e.op === '-' && b.t === 'neg') return { t: 'bin', op: '+', a, b: b.a };
      return { t: 'bin', op: e.op, a, b };
    }
    case 'neg': { const a = tidy(e.a); return a.t === 'neg' ? a.a : { t: 'neg', a }; }
    case 'call': return { t: 'call', fn: e.fn, args: e.args.map(tidy) };
    default: return e;
  }
}

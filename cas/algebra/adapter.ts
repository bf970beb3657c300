/**
 * The one door to the symbolic algebra package. Its answers are never trusted
 * as they come: general-purpose algebra loses signs and phases of complex
 * quantities (for example it rewrites sqrt(-i) onto the wrong sheet), so every
 * answer is compared numerically with the question at sample points before use.
 */
import nerdamer from 'nerdamer';
import 'nerdamer/Calculus.js';
import 'nerdamer/Algebra.js';
import type { Expr } from '../lang/ast.js';
import { parseExpression } from '../lang/parse.js';
import { evaluate, relDiff } from '../expr/evaluate.js';
import { freeNames } from '../expr/names.js';
import type { Point } from '../domains/sample.js';

/** Our names become opaque ones so that no name collides with a function or constant of the package. */
class Renaming {
  private readonly toSafe = new Map<string, string>();
  private readonly fromSafe = new Map<string, string>();
  safe(name: string): string {
    let s = this.toSafe.get(name);
    if (s === undefined) {
      s = `qv${this.toSafe.size}z`;
      this.toSafe.set(name, s);
      this.fromSafe.set(s, name);
    }
    return s;
  }
  back(text: string): string { return text.replace(/qv[0-9]+z/g, (s) => this.fromSafe.get(s) ?? s); }
}

/** Fully parenthesized text the package reads unambiguously. */
function emit(e: Expr, r: Renaming): string {
  switch (e.t) {
    case 'num': return e.v;
    case 'const': return e.name;
    case 'name': return r.safe(e.name);
    case 'neg': return `(-(${emit(e.a, r)}))`;
    case 'bin': return `((${emit(e.a, r)})${e.op}(${emit(e.b, r)}))`;
    case 'call': return `${e.fn}(${e.args.map((a) => emit(a, r)).join(',')})`;
  }
}

function read(text: string, r: Renaming): Expr {
  return parseExpression(r.back(text));
}

/** True when a and b agree at every point (relative 1e-9); points where either is not finite are skipped. */
export function agreeAt(a: Expr, b: Expr, points: readonly Point[], tol = 1e-9): boolean {
  let checked = 0;
  for (const p of points) {
    let va; let vb;
    try { va = evaluate(a, p); vb = evaluate(b, p); } catch { return false; }
    if (!Number.isFinite(va.abs()) || !Number.isFinite(vb.abs())) continue;
    if (va.abs() < 1e-250 && vb.abs() < 1e-250) { checked++; continue; }
    if (relDiff(va, vb) > tol) return false;
    checked++;
  }
  return checked > 0;
}

function run(fn: (r: Renaming) => string): Expr | null {
  const r = new Renaming();
  try {
    const out = fn(r);
    return read(out, r);
  } catch {
    return null;
  } finally {
    nerdamer.flush();
  }
}

/** d e / d v, exact, or null when the package fails. Check it before use. */
export function differentiate(e: Expr, v: string): Expr | null {
  return run((r) => nerdamer.diff(emit(e, r), r.safe(v)).toString());
}

function transform(op: 'expand' | 'simplify', e: Expr): Expr | null {
  return run((r) => nerdamer(`${op}(${emit(e, r)})`).toString());
}

/**
 * The package's expanded or simplified form of e when it agrees with e at all
 * the points (which must give a value to every free name), otherwise e itself.
 */
export function rewriteChecked(op: 'expand' | 'simplify', e: Expr, points: readonly Point[]): { expr: Expr; accepted: boolean } {
  const out = transform(op, e);
  if (out === null) return { expr: e, accepted: false };
  for (const n of freeNames(out).keys()) if (!freeNames(e).has(n)) return { expr: e, accepted: false };
  return agreeAt(e, out, points) ? { expr: out, accepted: true } : { expr: e, accepted: false };
}

/** True when the package simplifies a - b to exactly 0 (a claim to be confirmed numerically by the caller). */
export function simplifiesToZero(a: Expr, b: Expr): boolean {
  const out = run((r) => nerdamer(`simplify((${emit(a, r)})-(${emit(b, r)}))`).toString());
  return out !== null && out.t === 'num' && Number(out.v) === 0;
}

/** The package's limit of e as v -> to (a number expression or Infinity), or null. Check it before use. */
export function limitOf(e: Expr, v: string, to: Expr | 'inf'): Expr | null {
  return run((r) => nerdamer(`limit(${emit(e, r)}, ${r.safe(v)}, ${to === 'inf' ? 'Infinity' : emit(to, r)})`).toString());
}

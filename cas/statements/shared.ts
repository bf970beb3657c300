/** Small helpers the issue-4 statements share: looking up results, binding parameter values, angles in words. */
import { Complex } from 'complex.js';
import type { Binding, NameRef } from '../lang/ast.js';
import { evaluate } from '../expr/evaluate.js';
import { formulaOf } from '../expr/print.js';
import { parseExpression } from '../lang/parse.js';
import type { Formula } from '../../shared/evaluation.js';
import type { DiagramData } from '../../shared/diagram.js';
import { freeNames } from '../expr/names.js';
import type { Point } from '../domains/sample.js';
import { StatementFailure, type AvailableResult, type Context } from './context.js';

export function resultNamed(ctx: Context, ref: NameRef, line: number, what: string): AvailableResult {
  const r = ctx.results.get(ref.name);
  if (!r) throw new StatementFailure(`There is no result named ${ref.name} above this line.`, line, ref.span.start.column);
  const { unavailable, valueAt } = r;
  if (unavailable !== null || !valueAt) throw new StatementFailure(`This ${what} depends on ${unavailable ?? `${ref.name}, which has no value`}.`, line, ref.span.start.column);
  return { ...r, unavailable, valueAt };
}

/** NAME = EXPR, ... as a point; values must be numbers (no free names). */
export function bindPoint(ctx: Context, bindings: readonly Binding[], line: number): Point {
  const p: Point = new Map();
  for (const b of bindings) {
    if (!ctx.params.has(b.name.name)) throw new StatementFailure(`${b.name.name} is not a declared parameter.`, line, b.name.span.start.column);
    if (p.has(b.name.name)) throw new StatementFailure(`${b.name.name} is given twice.`, line, b.name.span.start.column);
    const free = [...freeNames(b.value).keys()];
    if (free.length) throw new StatementFailure(`The value of ${b.name.name} must be a number, not an expression in ${free.join(', ')}.`, line, b.name.span.start.column);
    const v = evaluate(b.value, new Map());
    const dom = ctx.params.get(b.name.name)!.domain;
    const realOnly = dom !== 'complex';
    if (realOnly && Math.abs(v.im) > 0) throw new StatementFailure(`${b.name.name} is declared ${dom}, so its value must be real.`, line, b.name.span.start.column);
    if ((dom === 'positive' && !(v.re > 0)) || (dom === 'negative' && !(v.re < 0)) || (dom === 'nonzero' && v.re === 0)) {
      throw new StatementFailure(`${b.name.name} is declared ${dom}; ${v.re} is outside that domain.`, line, b.name.span.start.column);
    }
    if (ctx.params.get(b.name.name)!.integer && !Number.isInteger(v.re)) {
      throw new StatementFailure(`${b.name.name} is declared a positive integer; ${v.re} is not a whole number.`, line, b.name.span.start.column);
    }
    p.set(b.name.name, new Complex(v.re, v.im));
  }
  return p;
}

/** An angle as a multiple of pi with a small denominator when it is one, else radians. */
export function angleText(a: number): string {
  for (const q of [1, 2, 3, 4, 6, 8, 12, 16]) {
    const p = Math.round((a / Math.PI) * q);
    if (Math.abs(p / q - a / Math.PI) < 1e-12) {
      if (p === 0) return '0';
      const num = p === 1 ? 'pi' : p === -1 ? '-pi' : `${p}*pi`;
      return q === 1 ? num : `${num}/${q}`;
    }
  }
  return `${Number(a.toPrecision(6))} rad`;
}

/** An angle for the record: a multiple of pi exactly where it is one, else its decimal marked as floating point. */
export function angleFormula(a: number): Formula {
  const t = angleText(a);
  if (t.endsWith(' rad')) return { text: `≈ ${t.slice(0, -4)}`, latex: `\\approx ${t.slice(0, -4)}` };
  return formulaOf(parseExpression(t));
}

export const rel = (a: { re: number; im: number }, b: { re: number; im: number }) =>
  Math.hypot(a.re - b.re, a.im - b.im) / Math.max(Math.hypot(b.re, b.im), 1e-300);

export const unitLine = (theta: number, r = 3) => [
  { re: -r * Math.cos(theta), im: -r * Math.sin(theta) }, { re: r * Math.cos(theta), im: r * Math.sin(theta) },
];

export const PRINCIPAL_CUT = { label: 'Principal cut of sqrt (negative real axis)', points: [{ re: 0, im: 0 }, { re: -1e6, im: 0 }] };

/** The diagram of an integral: its real contour, the principal cut, and the eigenvalues of A at the point named. */
export function integralDiagram(eigenvalues: readonly { re: number; im: number }[], at: string | undefined): DiagramData {
  return {
    contours: [{ label: 'Real contour', role: 'real', points: unitLine(0) }],
    sectors: [], cuts: [PRINCIPAL_CUT], paths: [], tracks: [],
    eigenvalues: eigenvalues.map((z) => ({ re: z.re, im: z.im, arg: Math.atan2(z.im, z.re) })),
    ...(at ? { eigenvaluesAt: at } : {}),
  };
}

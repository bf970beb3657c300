/**
 * Rotations of one variable decided exactly. The angle is kept as written,
 * theta = q*pi + r with q and r rational (exp(-i*(pi/4 + 0.0005))*x gives q = -1/4,
 * r = -1/2000). For the coupling a(p) of the variable the family x -> e^(i phi) x,
 * phi from 0 to theta, never meets growth iff Re a >= 0 and Re(a e^(2 i theta)) >= 0
 * and |theta| <= pi/2 (the argument of a e^(2 i phi) moves linearly in phi). With
 * Re a and Im a of degree at most one in the parameter, the second condition is
 * p >= p* or p <= p* with p* written through sin and cos of the exact angle, e.g.
 * k >= tan(1/1000).
 */
import { qExpr } from '../expr/fromExact.js';
import type { Expr } from '../lang/ast.js';
import type { Formula } from '../../shared/evaluation.js';
import { fromExpr, type RatFunc } from '../exact/ratfunc.js';
import { variables, coefficients, degree } from '../exact/poly.js';
import { qToNumber, qIsZero, qsign, qmul, qint, qadd, type Q, qToString, q as mkq } from '../exact/q.js';
import { add, call, div, mul, neg, num, PI } from '../expr/build.js';
import { formulaOf } from '../expr/print.js';
import { rfIm, rfRe } from './exactGaussian.js';

/** theta = q*pi + r exactly, with the expression as written. */
export interface ExactAngle { q: Q; r: Q; expr: Expr; radians: number }

/** The angle of a unit factor exp(i*X) (X linear in pi with rational coefficients), i, -i, 1 or -1. */
export function exactAngleOf(factor: Expr, variable: string): ExactAngle | null {
  // FACTOR*x: drop the variable
  const strip = (e: Expr): Expr | null => {
    if (e.t === 'bin' && e.op === '*') {
      if (e.b.t === 'name' && e.b.name === variable) return e.a;
      if (e.a.t === 'name' && e.a.name === variable) return e.b;
    }
    return null;
  };
  const f = strip(factor);
  if (!f) return null;
  const unit = (k: number): ExactAngle => { const qq = mkq(BigInt(k), 2n); return { q: qq, r: qint(0), expr: angleExpr(qq, qint(0)), radians: (k * Math.PI) / 2 }; };
  const c = fromExpr(f);
  if (c && variables(c.num).length === 0 && variables(c.den).length === 0) {
    const v = [...c.num.terms.values()][0]?.c;
    if (!v) return null;
    const re = qToNumber(v.re); const im = qToNumber(v.im);
    if (re === 1 && im === 0) return unit(0);
    if (re === 0 && im === 1) return unit(1);
    if (re === -1 && im === 0) return unit(2);
    if (re === 0 && im === -1) return unit(-1);
    return null;
  }
  if (f.t !== 'call' || f.fn !== 'exp') return null;
  // exp(i*X) / exp(X*i) / exp(-i*X): X = arg / i
  const arg = fromExpr(f.args[0]!);
  if (!arg) return null;
  const x: RatFunc = { num: arg.num, den: arg.den };
  // X = -i * arg must be real and linear in pi
  const re = rfRe(x); const im = rfIm(x);
  if (!rfIsZeroPoly(re)) return null;
  const vars = [...variables(im.num), ...variables(im.den)];
  if (vars.some((v) => v !== 'pi') || variables(im.den).length) return null;
  const cs = coefficients(im.num, 'pi');
  if (degree(im.num, 'pi') > 1) return null;
  const den = [...im.den.terms.values()][0]!.c.re;
  const r0 = cs[0] && cs[0].terms.size ? [...cs[0].terms.values()][0]!.c.re : qint(0);
  const q1 = cs[1] && cs[1].terms.size ? [...cs[1].terms.values()][0]!.c.re : qint(0);
  const inv = mkq(den.d, den.n);
  const qq = qmul(q1, inv); const rr = qmul(r0, inv);
  return { q: qq, r: rr, expr: angleExpr(qq, rr), radians: qToNumber(qq) * Math.PI + qToNumber(rr) };
}

const rfIsZeroPoly = (r: RatFunc) => r.num.terms.size === 0;

/** q*pi + r as written by a physicist: pi/4 + 1/2000, -(pi/4 + 1/2000). */
export function angleExpr(q: Q, r: Q): Expr {
  if (qsign(q) < 0 && qsign(r) <= 0) return neg(angleExpr({ n: -q.n, d: q.d }, { n: -r.n, d: r.d }));
  const piPart = qIsZero(q) ? null : q.n === 1n ? (q.d === 1n ? PI : div(PI, num(q.d.toString()))) : q.d === 1n ? mul(num(q.n.toString()), PI) : div(mul(num(q.n.toString()), PI), num(q.d.toString()));
  if (!piPart) return qExpr(r);
  if (qIsZero(r)) return piPart;
  return add(piPart, qExpr(r));
}

export interface OneVariableLegality {
  /** Legal on the whole domain, nowhere, or from a threshold on. */
  kind: 'everywhere' | 'nowhere' | 'threshold';
  /** p >= threshold (above) or p <= threshold (below). */
  threshold?: { param: string; value: Formula; approx: number; above: boolean };
}

/**
 * Re(a e^(2 i theta)) >= 0 on the domain of the one parameter of a (or for a without one),
 * when Re a and Im a are of degree <= 1 in it; null when that is not the case.
 */
export function endContourCondition(a: RatFunc, angle: ExactAngle, param: string | null, domainLo: number, domainHi: number): OneVariableLegality | null {
  if (Math.abs(angle.radians) > Math.PI / 2 + 1e-15) return { kind: 'nowhere' };
  const re = rfRe(a); const im = rfIm(a);
  if (variables(re.den).length || variables(im.den).length) return null;
  const lin = (r: RatFunc): [number, number, Q, Q] | null => {
    if (param === null) { const c = [...r.num.terms.values()][0]?.c.re ?? qint(0); const d = [...r.den.terms.values()][0]!.c.re; return [qToNumber(c) / qToNumber(d), 0, c, qint(0)]; }
    if (degree(r.num, param) > 1 || variables(r.num).some((v) => v !== param)) return null;
    const cs = coefficients(r.num, param);
    const d = [...r.den.terms.values()][0]!.c.re;
    const c0 = cs[0]?.terms.size ? [...cs[0].terms.values()][0]!.c.re : qint(0);
    const c1 = cs[1]?.terms.size ? [...cs[1].terms.values()][0]!.c.re : qint(0);
    return [qToNumber(c0) / qToNumber(d), qToNumber(c1) / qToNumber(d), mkq(c0.n * d.d, c0.d * d.n), mkq(c1.n * d.d, c1.d * d.n)];
  };
  const A = lin(re); const B = lin(im);
  if (!A || !B) return null;
  // 2 theta = m*pi/2 + 2r: cos and sin of it through cos(2r), sin(2r) exactly
  const twoQ = qmul(angle.q, qint(2));
  const twoR = qmul(angle.r, qint(2));
  const m4 = qmul(twoQ, qint(2)); // 2q in units of pi/2
  if (m4.d !== 1n) return null;
  const m = Number(((m4.n % 4n) + 4n) % 4n);
  // write the trig factors of a positive angle: sin(-y) = -sin(y), cos(-y) = cos(y)
  const flip = qsign(twoR) < 0 ? -1 : 1;
  const x = qExpr(flip < 0 ? { n: -twoR.n, d: twoR.d } : twoR);
  const cosX = qIsZero(twoR) ? num(1) : call('cos', x);
  const sinX = qIsZero(twoR) ? num(0) : call('sin', x);
  // cos(m pi/2 + X), sin(m pi/2 + X)
  // cos(m pi/2 + X) and sin(m pi/2 + X) as sign * cos(|X|) or sign * sin(|X|)
  const C: [number, Expr][] = [[1, cosX], [-flip, sinX], [-1, cosX], [flip, sinX]].map(([s, e]) => [s as number, e as Expr]);
  const S: [number, Expr][] = [[flip, sinX], [1, cosX], [-flip, sinX], [-1, cosX]].map(([s, e]) => [s as number, e as Expr]);
  const [cs, ce] = C[m]!; const [ss, se] = S[m]!;
  const X = Math.abs(qToNumber(twoR));
  const cval = cs * (ce === cosX ? Math.cos(X) : Math.sin(X));
  const sval = ss * (se === sinX ? Math.sin(X) : Math.cos(X));
  // P(p) = (A0 c - B0 s) + (A1 c - B1 s) p
  const k0 = A[0] * cval - B[0] * sval; const k1 = A[1] * cval - B[1] * sval;
  if (param === null || Math.abs(k1) < 1e-300) return { kind: k0 >= 0 ? 'everywhere' : 'nowhere' };
  const pStar = -k0 / k1;
  const above = k1 > 0;
  if (above ? pStar <= domainLo : pStar >= domainHi) return { kind: 'everywhere' };
  if (above ? pStar >= domainHi : pStar <= domainLo) return { kind: 'nowhere' };
  // p* = -(A0 c - B0 s)/(A1 c - B1 s), written with the exact trig factors
  const lincomb = (a: Q, b: Q): Expr => {
    const t1 = qIsZero(a) ? null : mul(qExpr(qmul(a, qint(cs))), ce);
    const t2 = qIsZero(b) ? null : mul(qExpr(qmul(b, qint(-ss))), se);
    return t1 && t2 ? add(t1, t2) : t1 ?? t2 ?? num(0);
  };
  const top = lincomb(A[2], B[2]); const bottom = lincomb(A[3], B[3]);
  let value: Expr = neg(div(top, bottom));
  // -(a*sin X)/(b*cos X) is -(a/b)*tan(X)
  const ratioOf = (e: Expr): [Expr, Expr] | null => {
    if (e.t === 'bin' && e.op === '*') return [e.a, e.b];
    if (e.t === 'call') return [num(1), e];
    if (e.t === 'neg' && e.a.t === 'call') return [num(-1), e.a];
    if (e.t === 'neg' && e.a.t === 'bin' && e.a.op === '*') return [neg(e.a.a), e.a.b];
    return null;
  };
  const t = ratioOf(top); const b = ratioOf(bottom);
  if (t && b && t[1].t === 'call' && b[1].t === 'call') {
    const coef = neg(div(t[0], b[0]));
    if (t[1].fn === 'sin' && b[1].fn === 'cos') value = mul(coef, call('tan', x));
    if (t[1].fn === 'cos' && b[1].fn === 'sin') value = div(coef, call('tan', x));
  }
  return { kind: 'threshold', threshold: { param, value: formulaOf(value), approx: pStar, above } };
}

export { qToString, qadd };

/**
 * Laurent polynomials in real-valued parameters with Gaussian-rational
 * coefficients. They carry the exact real part of a matrix entry, from which
 * simple sign rules prove convergence. Anything outside this class returns null.
 */
import type { Expr } from '../lang/ast.js';
import type { Domain } from '../../shared/evaluation.js';
import { gadd, gmul, ginv, gq, gsub, gzero, q, qFromDecimal, qsign, type GQ } from './rational.js';
import { identifierOrder } from '../expr/identifierOrder.js';

/** Monomial: sorted "name^exp" pairs; coefficient exact. */
export type Laurent = Map<string, { exps: Map<string, number>; c: GQ }>;

const monoKey = (m: Map<string, number>) => [...m].filter(([, e]) => e !== 0).sort(([a], [b]) => identifierOrder(a, b)).map(([n, e]) => `${n}^${e}`).join('*');

function single(c: GQ, exps = new Map<string, number>()): Laurent { return new Map([[monoKey(exps), { exps, c }]]); }

function addTo(out: Laurent, exps: Map<string, number>, c: GQ): void {
  const k = monoKey(exps);
  const prev = out.get(k);
  const sum = prev ? gadd(prev.c, c) : c;
  if (gzero(sum)) out.delete(k); else out.set(k, { exps, c: sum });
}

export function lplus(a: Laurent, b: Laurent, sign = 1): Laurent {
  const out: Laurent = new Map(a);
  for (const t of b.values()) addTo(out, t.exps, sign < 0 ? gsub(gq(q(0n)), t.c) : t.c);
  return out;
}

export function ltimes(a: Laurent, b: Laurent): Laurent {
  const out: Laurent = new Map();
  for (const x of a.values()) for (const y of b.values()) {
    const exps = new Map(x.exps);
    for (const [n, e] of y.exps) exps.set(n, (exps.get(n) ?? 0) + e);
    for (const [n, e] of [...exps]) if (e === 0) exps.delete(n);
    addTo(out, exps, gmul(x.c, y.c));
  }
  return out;
}

/** pi and e enter as positive symbols. */
const CONST_DOMAIN: Record<string, Domain> = { pi: 'positive', e: 'positive' };
const NONZERO: Domain[] = ['positive', 'negative', 'nonzero'];

export function toLaurent(e: Expr, domains: ReadonlyMap<string, Domain>): Laurent | null {
  const domainOf = (n: string) => domains.get(n) ?? CONST_DOMAIN[n];
  const go = (x: Expr): Laurent | null => {
    switch (x.t) {
      case 'num': return single(gq(qFromDecimal(x.v)));
      case 'const':
        if (x.name === 'i') return single(gq(q(0n), q(1n)));
        return single(gq(q(1n)), new Map([[`%${x.name}`, 1]]));
      case 'name': {
        const d = domainOf(x.name);
        if (d === undefined || d === 'complex') return null;
        return single(gq(q(1n)), new Map([[x.name, 1]]));
      }
      case 'neg': { const a = go(x.a); return a && lplus(new Map(), a, -1); }
      case 'bin': {
        const a = go(x.a);
        if (!a) return null;
        if (x.op === '^') {
          const b = go(x.b);
          if (!b || b.size > 1) return null;
          const only = [...b.values()][0];
          const k = only ? only.c : gq(q(0n));
          if (only && only.exps.size > 0) return null;
          if (!gzero(gq(q(0n), k.im)) || k.re.d !== 1n) return null;
          const power = Number(k.re.n);
          if (Math.abs(power) > 16) return null;
          let base = a;
          if (power < 0) { const inv = invert(a); if (!inv) return null; base = inv; }
          let acc = single(gq(q(1n)));
          for (let j = 0; j < Math.abs(power); j++) acc = ltimes(acc, base);
          return acc;
        }
        const b = go(x.b);
        if (!b) return null;
        if (x.op === '+') return lplus(a, b);
        if (x.op === '-') return lplus(a, b, -1);
        if (x.op === '*') return ltimes(a, b);
        const inv = invert(b);
        return inv && ltimes(a, inv);
      }
      case 'call': return null;
    }
  };
  /** Only a single monomial in nonzero parameters has an inverse in this class. */
  const invert = (a: Laurent): Laurent | null => {
    if (a.size !== 1) return null;
    const t = [...a.values()][0]!;
    if (gzero(t.c)) return null;
    for (const n of t.exps.keys()) {
      const d = n.startsWith('%') ? 'positive' : domainOf(n);
      if (!d || !NONZERO.includes(d)) return null;
    }
    return single(ginv(t.c), new Map([...t.exps].map(([n, e]) => [n, -e])));
  };
  return go(e);
}

export function realPart(a: Laurent): Laurent {
  const out: Laurent = new Map();
  for (const t of a.values()) addTo(out, t.exps, gq(t.c.re));
  return out;
}
export function imagPart(a: Laurent): Laurent {
  const out: Laurent = new Map();
  for (const t of a.values()) addTo(out, t.exps, gq(t.c.im));
  return out;
}

/** Sign of one real monomial under the domains: 'pos' strictly, 'nonneg', or null when undecided. */
function monomialSign(t: { exps: Map<string, number>; c: GQ }, domains: ReadonlyMap<string, Domain>): 'pos' | 'neg' | 'nonneg' | 'nonpos' | null {
  if (qsign(t.c.im) !== 0) return null;
  let sign = qsign(t.c.re);
  let strict = true;
  for (const [n, e] of t.exps) {
    const d = n.startsWith('%') ? 'positive' : domains.get(n);
    const even = e % 2 === 0;
    if (d === 'positive') continue;
    if (d === 'negative') { if (!even) sign = -sign; continue; }
    if (d === 'nonzero') { if (!even) return null; continue; }
    if (d === 'real') { if (!even || e < 0) return null; strict = false; continue; }
    return null;
  }
  if (sign > 0) return strict ? 'pos' : 'nonneg';
  if (sign < 0) return strict ? 'neg' : 'nonpos';
  return null;
}

/** +1 when proved > 0 on the whole domain, -1 when proved < 0, 0 when proved identically zero, null otherwise. */
export function provedSign(a: Laurent, domains: ReadonlyMap<string, Domain>): 1 | -1 | 0 | null {
  if (a.size === 0) return 0;
  const signs = [...a.values()].map((t) => monomialSign(t, domains));
  if (signs.every((s) => s === 'pos' || s === 'nonneg') && signs.includes('pos')) return 1;
  if (signs.every((s) => s === 'neg' || s === 'nonpos') && signs.includes('neg')) return -1;
  return null;
}

/** Determinant by cofactor expansion (n is small where this is used). */
export function ldet(m: readonly (readonly Laurent[])[]): Laurent {
  const n = m.length;
  if (n === 0) return single(gq(q(1n)));
  if (n === 1) return m[0]![0]!;
  let acc: Laurent = new Map();
  for (let j = 0; j < n; j++) {
    const minor = m.slice(1).map((row) => row.filter((_, k) => k !== j));
    const term = ltimes(m[0]![j]!, ldet(minor));
    acc = lplus(acc, term, j % 2 === 0 ? 1 : -1);
  }
  return acc;
}

/** Parameter points inside the declared domains, from a fixed seed so that a record is reproducible. */
import { Complex } from 'complex.js';
import type { Basis, Domain, SampleBox } from '../../shared/evaluation.js';
import { complexFromParts } from '../gaussian/describe.js';

export type Params = ReadonlyMap<string, Domain>;
export type Point = Map<string, Complex>;

/** mulberry32: small, fast, deterministic. */
export function rng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Magnitudes spread over two decades, where couplings usually live. */
function magnitude(r: () => number): number { return Math.exp((r() * 2 - 1) * Math.log(10)); }

/** The box samplePoints draws from, for the record: magnitudes 0.1 to 10 (the first point is the simplest value). */
export function sampleBox(params: Params, names: readonly string[]): SampleBox {
  return names.map((name) => ({ name, domain: params.get(name) ?? 'complex', from: 0.1, to: 10 }));
}

/** A verdict checked at `count` points of the standard box, `agreeing` of them agreeing. */
export function sampledBasis(params: Params, names: readonly string[], count: number, agreeing = count): Basis {
  return { kind: 'sampled', count, agreeing, box: sampleBox(params, names) };
}

export function sampleValue(domain: Domain, r: () => number): Complex {
  const m = magnitude(r);
  switch (domain) {
    case 'positive': return new Complex(m, 0);
    case 'negative': return new Complex(-m, 0);
    case 'real': return new Complex(r() < 0.1 ? 0 : (r() < 0.5 ? -m : m), 0);
    case 'nonzero': return new Complex(r() < 0.5 ? -m : m, 0);
    case 'complex': { const phi = (r() * 2 - 1) * Math.PI; return new Complex(m * Math.cos(phi), m * Math.sin(phi)); }
  }
}

/** count points for the given parameters; the first point uses the simplest values (1, -1, 0, 1 + i). */
export function samplePoints(params: Params, names: readonly string[], count: number, seed = 12345): Point[] {
  const r = rng(seed);
  const points: Point[] = [];
  const simple: Record<Domain, Complex> = {
    positive: new Complex(1, 0), negative: new Complex(-1, 0), real: new Complex(0.5, 0),
    nonzero: new Complex(1, 0), complex: new Complex(1, 1),
  };
  for (let k = 0; k < count; k++) {
    const p: Point = new Map();
    for (const n of names) {
      const d = params.get(n) ?? 'complex';
      p.set(n, k === 0 ? simple[d] : sampleValue(d, r));
    }
    points.push(p);
  }
  return points;
}

/** Random complex values for names with no domain (integration variables in identity checks). */
export function randomComplexPoint(names: readonly string[], r: () => number, into: Point = new Map()): Point {
  for (const n of names) into.set(n, new Complex(r() * 2 - 1, r() * 2 - 1));
  return into;
}

export function pointRecord(p: Point): Record<string, { re: number; im: number }> {
  const out: Record<string, { re: number; im: number }> = {};
  for (const [k, v] of p) out[k] = { re: v.re, im: v.im };
  return out;
}

export function describePoint(p: Point): string {
  return [...p].map(([k, v]) => `${k} = ${formatComplex(v)}`).join(', ');
}

export function formatComplex(z: { re: number; im: number }, digits = 6): string {
  return complexFromParts(z.re, z.im, (x) => Number(x.toPrecision(digits)).toString());
}

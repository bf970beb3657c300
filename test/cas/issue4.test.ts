/**
 * rotate, continue, compare, verify, let, limit: checked against sources outside the project
 * (REFERENCES file; "from memory" where it says so) and against independent computations
 * (mathjs eigenvalues; the published formulas evaluated here with mathjs), never against cas/ itself.
 */
import { test } from 'node:test';
import assert from 'node:assert/strict';
import * as math from 'mathjs';
import { run, statement } from './support/run.js';
import { relErr, type Cx } from './support/reference.js';
import { agreesWithClosedForm } from '../../cas/statements/verify.js';
import { worksheetReport } from '../../shared/evaluation.js';

const fresnel = (a: number): Cx => ({ re: Math.sqrt(Math.PI / Math.abs(a)) * Math.cos(Math.sign(a) * Math.PI / 4), im: Math.sqrt(Math.PI / Math.abs(a)) * Math.sin(Math.sign(a) * Math.PI / 4) });
const times = (a: Cx, b: Cx): Cx => ({ re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re });
const unit = (t: number): Cx => ({ re: Math.cos(t), im: Math.sin(t) });

test('Fresnel on the line reached by rotating the convergent Gaussian exp(-x^2) by pi/4 — NIST DLMF 7.2 (from memory), Fresnel on the line (REFERENCES)', () => {
  const r = run('integral G = exp(-x^2) d(x)\nrotate G : x -> exp(i*pi/4)*x as GF');
  const s = r.statements[1]!;
  assert.equal(s.legal, true);
  assert.equal(s.convergence, 'oscillatory');
  // GF = e^(i pi/4) * integral exp(-i y^2) dy, and integral exp(i a y^2) = sqrt(pi/|a|) e^(i pi sgn(a)/4) with a = -1
  const expected = times(unit(Math.PI / 4), fresnel(-1));
  assert.ok(relErr(s.result!.value!, expected) < 1e-12, JSON.stringify(s.result));
});

test('Fresnel on the line reached by rotating the oscillatory exp(i a x^2) onto a convergent Gaussian — Fresnel on the line (REFERENCES); 1-D Gaussian G&R 3.323.2 (from memory)', () => {
  for (const a of [1.5, -0.8]) {
    const theta = a > 0 ? 'pi/4' : '-pi/4';
    const r = run(`integral W = exp(i*${a < 0 ? `(${a})` : a}*x^2) d(x)\nrotate W : x -> exp(i*${theta})*x as WG`);
    const s = r.statements[1]!;
    assert.equal(s.legal, true, JSON.stringify(s.steps));
    assert.equal(s.convergence, 'absolute');
    assert.ok(relErr(s.result!.value!, fresnel(a)) < 1e-12);
  }
});

test('rotations of exp(-x^2): inside (-pi/4, pi/4) legal, at the boundary legal and oscillatory, outside illegal with the first bad angle; complex couplings — exact rule Re(a e^(2 i phi)) >= 0 worked out here', () => {
  for (const [th, legal] of [['pi/8', true], ['-pi/6', true], ['pi/4', true], ['-pi/4', true], ['pi/3', false], ['-pi/2', false]] as const) {
    const s = run(`integral G = exp(-x^2) d(x)\nrotate G : x -> exp(i*${th})*x as R`).statements[1]!;
    assert.equal(s.legal, legal, th);
    if (!legal) {
      assert.equal(s.result, null);
      const first = s.steps.find((x) => x.kind === 'rotation')!.angles!.firstBad!;
      assert.ok(Math.abs(Math.abs(first) - Math.PI / 4) < 1e-12, `first bad angle ${first}`);
    } else {
      assert.ok(relErr(s.result!.value!, { re: Math.sqrt(Math.PI), im: 0 }) < 1e-12, 'Cauchy: the value does not change');
    }
  }
  // coupling a = (1 + i)/2 * 2: arg pi/4, so rotations in [-3pi/8, pi/8] are allowed
  for (const [th, legal] of [['pi/8', true], ['pi/6', false], ['-3*pi/8', true], ['-pi/2', false]] as const) {
    const s = run(`integral H = exp(-(1 + i)*x^2) d(x)\nrotate H : x -> exp(i*${th})*x as R`).statements[1]!;
    assert.equal(s.legal, legal, `complex coupling, ${th}`);
  }
});

test('two variables: rotating one variable legal, the other not — from the one-variable rule on the diagonal entries arg 0 and -pi/4 (worked out by hand)', () => {
  // exp(-x^2 - (1 - i) y^2): a_x = 2 (arg 0), a_y = 2 - 2i (arg -pi/4). y may turn by +pi/4 + pi/8 but not by -pi/4.
  const src = 'integral T = exp(-x^2 - (1 - i)*y^2 + x*y/4) d(x, y)';
  const ok = run(`${src}\nrotate T : y -> exp(i*pi/8)*y as R1`).statements[1]!;
  const bad = run(`${src}\nrotate T : y -> exp(-i*pi/4)*y as R2`).statements[1]!;
  assert.equal(ok.legal, true);
  assert.equal(bad.legal, false);
  assert.match(bad.steps.find((x) => x.kind === 'legality')!.text, /grid of 721 angles/);
});

/** Independent numeric continuation: mathjs eigenvalues of [[k, i lam], [i lam, k]], roots chosen continuous. */
function mathjsContinuation(k: number, path: Cx[]): Cx {
  let roots: math.Complex[] | null = null;
  let prev: math.Complex[] = [];
  for (let seg = 0; seg < path.length - 1; seg++) {
    for (let s = 0; s <= 2000; s++) {
      const a = path[seg]!; const b = path[seg + 1]!;
      const lam = math.complex(a.re + (b.re - a.re) * s / 2000, a.im + (b.im - a.im) * s / 2000);
      const M = math.matrix([[math.complex(k, 0), math.multiply(math.complex(0, 1), lam)], [math.multiply(math.complex(0, 1), lam), math.complex(k, 0)]]);
      let ev = (math.eigs(M as never, { eigenvectors: false } as never) as unknown as { values: math.Matrix }).values.toArray() as unknown as math.Complex[];
      ev = ev.map((z) => math.complex(z as never));
      if (prev.length) { // match to previous
        const d0 = (math.abs(math.subtract(ev[0]!, prev[0]!) as never) as unknown as number) + (math.abs(math.subtract(ev[1]!, prev[1]!) as never) as unknown as number);
        const d1 = (math.abs(math.subtract(ev[1]!, prev[0]!) as never) as unknown as number) + (math.abs(math.subtract(ev[0]!, prev[1]!) as never) as unknown as number);
        if (d1 < d0) ev = [ev[1]!, ev[0]!];
      }
      const r = ev.map((z) => math.sqrt(z) as math.Complex);
      if (roots) for (let j = 0; j < 2; j++) { const d = math.subtract(r[j]!, roots[j]!) as math.Complex; const e = math.add(r[j]!, roots[j]!) as math.Complex; if (math.abs(e as never) < math.abs(d as never)) r[j] = math.multiply(r[j]!, -1) as math.Complex; }
      roots = r; prev = ev;
    }
  }
  const sq = math.multiply(roots![0]!, roots![1]!) as math.Complex;
  const v = math.divide(2 * Math.PI, sq) as math.Complex;
  return { re: v.re, im: v.im };
}

const MODES = 'param k : positive\nparam lam : real\nintegral Z = exp(-(k*a^2 + 2*i*lam*a*b + k*b^2)/2) d(a, b)';

test('continuation of [[k, i lam], [i lam, k]] from 0 to 2ik, right and left of the branch point ik — facts of the trade (REFERENCES); end values against a mathjs-eigenvalue continuation', () => {
  for (const [side, mid, sheet] of [['right', { re: 0.6, im: 1 }, 'principal'], ['left', { re: -0.6, im: 1 }, 'minus-principal']] as const) {
    const path = `0 -> ${mid.re < 0 ? `(${mid.re})` : mid.re} + i -> 2*i`;
    const s = run(`${MODES}\ncontinue Z : lam along ${path} at k = 1`).statements[3]!;
    assert.equal(s.status, 'ok', JSON.stringify(s.error));
    const expected = mathjsContinuation(1, [{ re: 0, im: 0 }, mid, { re: 0, im: 2 }]);
    assert.ok(relErr(s.result!.value!, expected) < 1e-9, `${side}: ${JSON.stringify(s.result!.value)} vs ${JSON.stringify(expected)}`);
    assert.equal(s.sheet, sheet, side);
    const bp = s.steps.find((x) => x.event?.kind === 'branch-point');
    assert.ok(bp, 'the branch point is reported');
    assert.ok(Math.abs(bp.event!.at['lam']!.im - 1) < 1e-9 && Math.abs(bp.event!.at['lam']!.re) < 1e-9, 'located at lam = i k');
  }
});

test('once around the simple zero ik flips the sign, twice does not — facts of the trade (REFERENCES); mathjs-eigenvalue continuation', () => {
  const loop = [{ re: 0, im: 0 }, { re: 1, im: 1 }, { re: 0, im: 2 }, { re: -1, im: 1 }, { re: 0, im: 0 }];
  const once = run(`${MODES}\ncontinue Z : lam along 0 -> 1 + i -> 2*i -> -1 + i -> 0 at k = 1`).statements[3]!;
  const twice = run(`${MODES}\ncontinue Z : lam along 0 -> 1 + i -> 2*i -> -1 + i -> 0 -> 1 + i -> 2*i -> -1 + i -> 0 at k = 1`).statements[3]!;
  assert.equal(once.sheet, 'minus-principal');
  assert.equal(twice.sheet, 'principal');
  assert.ok(relErr(once.result!.value!, { re: -2 * Math.PI, im: 0 }) < 1e-9);
  assert.ok(relErr(twice.result!.value!, { re: 2 * Math.PI, im: 0 }) < 1e-9);
  assert.ok(relErr(once.result!.value!, mathjsContinuation(1, loop)) < 1e-9);
});

test('verify: the quadrature (a code path separate from the closed form) agrees on random convergent cases n = 1..3; a sign-perturbed closed form fed to the comparer is detected', () => {
  let seed = 7;
  const rnd = () => { seed = (seed * 16807) % 2147483647; return seed / 2147483647 - 0.5; };
  for (const n of [1, 2, 3]) {
    for (let rep = 0; rep < 2; rep++) {
      const vars = ['x', 'y', 'z'].slice(0, n);
      const terms: string[] = [];
      const A: Cx[][] = vars.map(() => vars.map(() => ({ re: 0, im: 0 })));
      for (let r = 0; r < n; r++) for (let c = r; c < n; c++) {
        const z = r === c ? { re: 1 + Math.abs(rnd()), im: rnd() * 2 } : { re: rnd() * 0.3, im: rnd() };
        A[r]![c] = z; A[c]![r] = z;
        const lit = `(${z.re.toFixed(6)} + (${z.im.toFixed(6)})*i)`;
        terms.push(r === c ? `${lit}*${vars[r]}^2/2` : `${lit}*${vars[r]}*${vars[c]}`);
      }
      const J = vars.map(() => ({ re: Number((rnd() * 0.5).toFixed(6)), im: Number((rnd() * 0.5).toFixed(6)) }));
      const lin = J.map((j, k) => `(${j.re} + (${j.im})*i)*${vars[k]}`).join(' + ');
      const src = `integral Q = exp(-(${terms.join(' + ')}) + ${lin}) d(${vars.join(', ')})\nverify Q`;
      const rep4 = run(src);
      const v = rep4.statements[1]!;
      assert.equal(v.agrees, true, `n=${n}: ${JSON.stringify(v.steps.map((x) => x.text))}`);
      const q = v.steps[0]!.quadrature!;
      assert.ok(q.evaluations > 0 && q.errorEstimate < 1e-8 * Math.hypot(q.value.re, q.value.im));
      // the wrong closed form (a sign flip) is refused by the comparer
      const closed = rep4.statements[0]!.result!.value!;
      assert.equal(agreesWithClosedForm(q.value, { re: -closed.re, im: -closed.im }).agrees, false);
      assert.equal(agreesWithClosedForm(q.value, closed).agrees, true);
    }
  }
});

test('verify: four variables are out of reach, said so rather than a poor number', () => {
  const v = run('integral F4 = exp(-(a^2 + b^2 + c^2 + u^2)/2) d(a, b, c, u)\nverify F4').statements[1]!;
  assert.equal(v.agrees, false);
  assert.equal(v.result, null);
  assert.match(v.error!.message, /out of reach/);
});

test('compare: a Lorentzian-Euclidean pair differing by the Fresnel phase exp(i pi/4) — Fresnel on the line (REFERENCES)', () => {
  const r = run('param w : positive\nintegral E = exp(-w*x^2/2) d(x)\nintegral L = exp(i*w*x^2/2) d(x)\ncompare L with E\ncompare E with E');
  assert.equal(r.statements[3]!.verdict, 'phase');
  assert.equal(r.statements[3]!.phaseOverPiQuarter, 1);
  assert.equal(r.statements[4]!.verdict, 'equal');
  assert.equal(r.statements[4]!.phaseOverPiQuarter, 0);
  const d = run('param w : positive\nintegral E = exp(-w*x^2/2) d(x)\nintegral E2 = exp(-w*x^2) d(x)\ncompare E with E2').statements[3]!;
  assert.equal(d.verdict, 'different');
  assert.equal(d.phaseOverPiQuarter, null);
});

test('let and limit: lam -> 0 limit is the square of the one-variable result; k -> inf behaves like 2 pi / k; -log of the one-variable result is (1/2) log k + const — REFERENCES facts of the trade, DLMF ch. 5 (Gamma(1/2))', () => {
  const r = run(`${MODES}\nlimit Z : lam -> 0\nlimit Z : k -> inf\nintegral G1 = exp(-k*x^2/2) d(x)\nlet F = -log(G1)`);
  const lim0 = r.statements[3]!; const limInf = r.statements[4]!; const F = r.statements[6]!;
  for (const k of [0.5, 2, 7]) {
    const got = math.evaluate(lim0.result!.text.replace(/abs\(k\)/g, 'k'), { k }) as number;
    assert.ok(Math.abs(got - Math.sqrt(2 * Math.PI / k) ** 2) < 1e-12 * got);
    const lead = math.evaluate(limInf.result!.text, { k }) as number;
    assert.ok(Math.abs(lead - 2 * Math.PI / k) < 1e-9 * lead, limInf.result!.text);
  }
  const c = [0.3, 1, 9].map((k) => (math.evaluate(F.result!.text, { k }) as number) - Math.log(k) / 2);
  assert.ok(Math.abs(c[0]! - c[1]!) < 1e-12 && Math.abs(c[1]! - c[2]!) < 1e-12, `constant ${c}`);
  assert.ok(Math.abs(c[0]! + Math.log(2 * Math.PI) / 2) < 1e-12);
});

test('command line JSON contract: legal, sheet, verdict, phaseOverPiQuarter, agrees are top-level, result.value set; schema holds', () => {
  const r = run(`${MODES}\nrotate Z : b -> exp(-i*pi/2)*b as ZL\ncontinue Z : lam along 0 -> 2*i*k/3\ncompare Z with Z\nverify Z at k = 2, lam = 0.7\nlet S = -log(Z)\nlimit Z : lam -> 0`);
  worksheetReport.parse(JSON.parse(JSON.stringify(r)));
  const byKind = (k: string) => r.statements.find((s) => s.kind === k)!;
  assert.equal(byKind('rotate').legal, false); assert.equal(byKind('rotate').result, null);
  assert.equal(byKind('continue').sheet, 'principal'); assert.ok(byKind('continue').result!.value);
  assert.equal(byKind('compare').verdict, 'equal'); assert.equal(byKind('compare').phaseOverPiQuarter, 0);
  assert.equal(byKind('verify').agrees, true); assert.ok(byKind('verify').result!.value);
  assert.ok(byKind('continue').diagram!.paths[0]!.events.length >= 1);
  assert.ok(byKind('rotate').diagram!.sectors.length === 1);
});

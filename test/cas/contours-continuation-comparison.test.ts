/**
 * rotate, continue, compare, verify, let, limit: checked against sources outside the project
 * (docs/references.md; "from memory" where it says so) and against independent computations
 * (mathjs eigenvalues; the published formulas evaluated here with mathjs), never against cas/ itself.
 */
import { test } from 'node:test';
import assert from 'node:assert/strict';
import * as math from 'mathjs';
import { run, statement } from './support/run.js';
import { gaussianReference, relErr, sqrtDetAlongPath, type Cx } from './support/reference.js';
import { integrateGaussian } from '../../cas/numeric/quadrature.js';
import { agreesWithClosedForm } from '../../cas/statements/verify.js';
import { worksheetReport } from '../../shared/evaluation.js';
import { complexLatex, complexText, quarterPhaseText } from '../../cas/gaussian/describe.js';
import { formatComplex } from '../../cas/domains/sample.js';
import { formatReport } from '../../cas/cli/format.js';
import { renderStep } from '../../shared/record/render.js';

const fresnel = (a: number): Cx => ({ re: Math.sqrt(Math.PI / Math.abs(a)) * Math.cos(Math.sign(a) * Math.PI / 4), im: Math.sqrt(Math.PI / Math.abs(a)) * Math.sin(Math.sign(a) * Math.PI / 4) });
const times = (a: Cx, b: Cx): Cx => ({ re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re });
const unit = (t: number): Cx => ({ re: Math.cos(t), im: Math.sin(t) });

test('Fresnel on the line reached by rotating the convergent Gaussian exp(-x^2) by pi/4 — NIST DLMF 7.2 (from memory), Fresnel on the line (docs/references.md)', () => {
  const r = run('integral G = exp(-x^2) d(x)\nrotate G : x -> exp(i*pi/4)*x as GF');
  const s = r.statements[1]!;
  assert.equal(s.legal, true);
  assert.equal(s.convergence, 'oscillatory');
  // GF = e^(i pi/4) * integral exp(-i y^2) dy, and integral exp(i a y^2) = sqrt(pi/|a|) e^(i pi sgn(a)/4) with a = -1
  const expected = times(unit(Math.PI / 4), fresnel(-1));
  assert.ok(relErr(s.result!.value!, expected) < 1e-12, JSON.stringify(s.result));
});

test('Fresnel on the line reached by rotating the oscillatory exp(i a x^2) onto a convergent Gaussian — Fresnel on the line (docs/references.md); 1-D Gaussian G&R 3.323.2 (from memory)', () => {
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
      const legality = s.steps.find((x) => x.kind === 'legality');
      assert.ok(legality?.kind === 'legality' && legality.firstBad?.angle);
      const first = math.evaluate(legality.firstBad.angle.text) as number;
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
  const legality = bad.steps.find((x) => x.kind === 'legality');
  assert.ok(legality?.kind === 'legality' && legality.method === 'grid' && legality.count > 0);
});

/** Independent numeric continuation: mathjs eigenvalues of [[k, i lam], [i lam, k]], roots chosen continuous. */
function mathjsContinuation(k: number, path: Cx[]): Cx {
  const asComplex = (v: unknown): math.Complex => {
    if (typeof v === 'number') return math.complex(v, 0);
    if (math.isComplex(v)) return v;
    throw new Error(`mathjs returned a non-numeric eigenvalue: ${String(v)}`);
  };
  const dist = (a: math.Complex, b: math.Complex) => Math.hypot(a.re - b.re, a.im - b.im);
  const STEPS = 2000;
  let roots: math.Complex[] | null = null;
  let prev: math.Complex[] | null = null;
  for (let seg = 0; seg < path.length - 1; seg++) {
    const a = path[seg]!; const b = path[seg + 1]!;
    for (let s = 0; s <= STEPS; s++) {
      const lam = { re: a.re + (b.re - a.re) * s / STEPS, im: a.im + (b.im - a.im) * s / STEPS };
      const K = math.complex(k, 0); const iLam = math.complex(-lam.im, lam.re);
      const { values } = math.eigs([[K, iLam], [iLam, K]], { eigenvectors: false });
      let ev = (Array.isArray(values) ? values : values.toArray()).map(asComplex);
      if (ev.length !== 2) throw new Error(`expected two eigenvalues, got ${ev.length}`);
      if (prev) { // keep each eigenvalue on its own track
        const same = dist(ev[0]!, prev[0]!) + dist(ev[1]!, prev[1]!);
        const swapped = dist(ev[1]!, prev[0]!) + dist(ev[0]!, prev[1]!);
        if (swapped < same) ev = [ev[1]!, ev[0]!];
      }
      const r = ev.map((z) => math.sqrt(z));
      if (roots) for (let j = 0; j < 2; j++) {
        const minus = math.complex(-r[j]!.re, -r[j]!.im);
        if (dist(minus, roots[j]!) < dist(r[j]!, roots[j]!)) r[j] = minus;
      }
      roots = r; prev = ev;
    }
  }
  if (!roots) throw new Error('empty path');
  const sq = math.multiply(roots[0]!, roots[1]!);
  const v = asComplex(math.divide(math.complex(2 * Math.PI, 0), sq));
  return { re: v.re, im: v.im };
}

const MODES = 'param k : positive\nparam lam : real\nintegral Z = exp(-(k*a^2 + 2*i*lam*a*b + k*b^2)/2) d(a, b)';

test('continuation of [[k, i lam], [i lam, k]] from 0 to 2ik, right and left of the branch point ik — facts of the trade (docs/references.md); end values against a mathjs-eigenvalue continuation', () => {
  for (const [side, mid, sheet] of [['right', { re: 0.6, im: 1 }, 'principal'], ['left', { re: -0.6, im: 1 }, 'minus-principal']] as const) {
    const path = `0 -> ${mid.re < 0 ? `(${mid.re})` : mid.re} + i -> 2*i`;
    const s = run(`${MODES}\ncontinue Z : lam along ${path} at k = 1`).statements[3]!;
    assert.equal(s.status, 'ok', JSON.stringify(s.error));
    const expected = mathjsContinuation(1, [{ re: 0, im: 0 }, mid, { re: 0, im: 2 }]);
    assert.ok(relErr(s.result!.value!, expected) < 1e-9, `${side}: ${JSON.stringify(s.result!.value)} vs ${JSON.stringify(expected)}`);
    assert.equal(s.sheet, sheet, side);
    const bp = s.steps.find((x) => x.kind === 'continuation-event' && x.event === 'branch-point');
    assert.ok(bp?.kind === 'continuation-event', 'the branch point is reported');
    assert.ok(Math.abs(bp.at['lam']!.im - 1) < 1e-9 && Math.abs(bp.at['lam']!.re) < 1e-9, 'located at lam = i k');
  }
});

test('a path straight through the branch point lam = ik is refused with the place named, as a statement error, not an internal one — det A = k^2 + lam^2 vanishes there (worked out by hand)', () => {
  const s = run(`${MODES}\ncontinue Z : lam along 0 -> 2*i at k = 1`).statements[3]!;
  assert.equal(s.status, 'error');
  assert.match(s.error!.message, /^The path passes through a branch point \(det A = 0\) near lam = /);
  assert.match(s.error!.message, /Move the path off it/);
  assert.doesNotMatch(s.error!.message, /Internal error/);
  assert.equal(s.error!.line, 4);
});

test('once around the simple zero ik flips the sign, twice does not — facts of the trade (docs/references.md); mathjs-eigenvalue continuation', () => {
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
      assert.equal(v.agrees, true, `n=${n}: ${JSON.stringify(v.steps.map((x) => renderStep(x).text))}`);
      const q = v.steps[0]!;
      assert.ok(q.kind === 'numeric-check' && q.value && q.errorEstimate !== null);
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

test('compare: a Lorentzian-Euclidean pair differing by the Fresnel phase exp(i pi/4) — Fresnel on the line (docs/references.md)', () => {
  const r = run('param w : positive\nintegral E = exp(-w*x^2/2) d(x)\nintegral L = exp(i*w*x^2/2) d(x)\ncompare L with E\ncompare E with E');
  assert.equal(r.statements[3]!.verdict, 'phase');
  assert.equal(r.statements[3]!.phaseOverPiQuarter, 1);
  assert.equal(r.statements[4]!.verdict, 'equal');
  assert.equal(r.statements[4]!.phaseOverPiQuarter, 0);
  const d = run('param w : positive\nintegral E = exp(-w*x^2/2) d(x)\nintegral E2 = exp(-w*x^2) d(x)\ncompare E with E2').statements[3]!;
  assert.equal(d.verdict, 'different');
  assert.equal(d.phaseOverPiQuarter, null);
});

test('let and limit: lam -> 0 limit is the square of the one-variable result; k -> inf tends to 0 like 2 pi / k; -log of the one-variable result is (1/2) log k + const — docs/references.md facts of the trade, DLMF ch. 5 (Gamma(1/2))', () => {
  const r = run(`${MODES}\nlimit Z : lam -> 0\nlimit Z : k -> inf\nintegral G1 = exp(-k*x^2/2) d(x)\nlet F = -log(G1)`);
  const lim0 = r.statements[3]!; const limInf = r.statements[4]!; const F = r.statements[6]!;
  for (const k of [0.5, 2, 7]) {
    const got = math.evaluate(lim0.result!.text, { k }) as number;
    assert.ok(Math.abs(got - Math.sqrt(2 * Math.PI / k) ** 2) < 1e-12 * got);
  }
  // k -> inf: the limit is 0, approached like 2*pi/k (the leading term, exactly)
  const step = limInf.steps.find((x) => x.kind === 'limit');
  assert.ok(step?.kind === 'limit' && step.outcome === 'value');
  assert.equal(limInf.result!.text, '0');
  assert.equal(step.rate?.text, '2*pi/k', 'the constant is written as 2*pi, not as a decimal');
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

test('numbers in the record: a unit imaginary part prints as i (0.33333 + i, -i, 2*i), in text and LaTeX, in every writer', () => {
  const cases: [Cx, string, string][] = [
    [{ re: 1 / 3, im: 1 }, '0.333333 + i', '0.333333 + i'],
    [{ re: 1 / 3, im: -1 }, '0.333333 - i', '0.333333 - i'],
    [{ re: 0, im: -1 }, '-i', '-i'],
    [{ re: 0, im: 1 }, 'i', 'i'],
    [{ re: 0, im: 2 }, '2*i', '2\\,i'],
    [{ re: 0.5, im: -2.25 }, '0.5 - 2.25*i', '0.5 - 2.25\\,i'],
    [{ re: -3, im: 0 }, '-3', '-3'],
  ];
  for (const [z, text, latex] of cases) {
    assert.equal(complexText(z), text);
    assert.equal(complexLatex(z), latex);
    assert.equal(formatComplex(z), text);
  }
  assert.equal(quarterPhaseText(1), 'exp(i*pi/4)');
  assert.equal(quarterPhaseText(-1), 'exp(-i*pi/4)');
  assert.equal(quarterPhaseText(3), 'exp(3*i*pi/4)');
  // the command line's readable report, and a record's eigenvalue text (two Fresnel factors: eigenvalues -i)
  const r = run('integral G = exp(-(1 + i)*x^2) d(x)\nverify G');
  const printed = formatReport(r);
  assert.doesNotMatch(printed, /[^0-9.]1\*i/, printed);
  const f = run('param w : positive\nintegral F = exp(i*w*(x^2 + y^2)/2) d(x, y)');
  const branch = renderStep(f.statements[1]!.steps.find((x) => x.kind === 'branch')!).text;
  assert.match(branch, /≈ -i \(arg ≈ -0\.5\*pi\), ≈ -i \(arg ≈ -0\.5\*pi\)/, branch);
  assert.doesNotMatch(JSON.stringify(f), /[^0-9.]1\*i/);
});

test('verify quadrature: the three interchangeable rules agree, and a case whose inner integrand oscillates fast far from the peak (where halving alone can agree on a shared alias) is right — against (2 pi)^(n/2) det(A)^(-1/2) exp(J^T A^-1 J / 2) by mathjs, Folland App. A (from memory)', () => {
  const cases: { A: Cx[][]; J: Cx[] }[] = [
    { A: [[{ re: 1.3, im: 0.4 }]], J: [{ re: 0.2, im: -0.3 }] },
    { A: [[{ re: 1.2, im: 0.6 }, { re: 0.1, im: -0.3 }], [{ re: 0.1, im: -0.3 }, { re: 0.9, im: 0.2 }]], J: [{ re: 0.3, im: 0.1 }, { re: -0.2, im: 0.4 }] },
    // Re A = [[0.38, -0.2], [-0.2, 0.8]], Im A with a large off-diagonal entry: the inner local frequency grows with the outer variable
    { A: [[{ re: 0.37978318494274416, im: -0.6337190352537292 }, { re: -0.19994713759393526, im: -0.9158255094270341 }], [{ re: -0.19994713759393526, im: -0.9158255094270341 }, { re: 0.8017572621778946, im: -0.27933694016157506 }]], J: [{ re: -0.8159532955921969, im: 0.2729609819468861 }, { re: -0.3447764186862746, im: -0.6572688602177748 }] },
  ];
  for (const { A, J } of cases) {
    const n = A.length;
    const q = { n, are: A.flat().map((z) => z.re), aim: A.flat().map((z) => z.im), jre: J.map((z) => z.re), jim: J.map((z) => z.im), cre: 0, cim: 0, pre: 1, pim: 0 };
    const expected = gaussianReference(A, J, sqrtDetAlongPath(A));
    for (const method of ['trapezoid', 'double-exponential', 'gauss-kronrod'] as const) {
      const r = integrateGaussian(q, 1e-10, 20000, method);
      assert.equal(r.timedOut, false, method);
      assert.ok(relErr(r, expected) < 1e-9, `${method}, n = ${n}: ${r.re} + ${r.im} i vs ${expected.re} + ${expected.im} i`);
      assert.ok(relErr(r, expected) * Math.hypot(expected.re, expected.im) <= 3 * r.error, `${method}: the error estimate ${r.error} covers the error`);
    }
  }
});

test('a rotation that is illegal at once is reported at t = 0+, not at a small t where bisection stopped — mathjs eigenvalues of Re(D A D) at t = 1e-9 and the allowed opposite direction', () => {
  // Re A = [[1, 1], [1, 1]] is singular along (1, -1); Im A = [[0, 1], [1, 0]].
  const r = run('integral W = exp(-(x^2 + 2*(1 + i)*x*y + y^2)/2) d(x, y)\nrotate W : x -> exp(-i*pi/4)*x, y -> exp(-i*pi/4)*y as WR\nrotate W : x -> exp(i*pi/8)*x, y -> exp(i*pi/8)*y as WS');
  const bad = r.statements[1]!.steps.find((s) => s.kind === 'legality')!;
  assert.equal(bad.kind === 'legality' && bad.legal, false);
  assert.equal(bad.kind === 'legality' && bad.firstBad?.t, 0);
  assert.match(renderStep(bad).text, /t = 0\+/);
  // independent: the smallest eigenvalue of Re(e^(2 i t theta) A) just after the start, both directions
  const reRot = (theta: number, t: number) => {
    const ph = math.complex(Math.cos(2 * t * theta), Math.sin(2 * t * theta));
    const A = [[math.complex(1, 0), math.complex(1, 1)], [math.complex(1, 1), math.complex(1, 0)]];
    return A.map((row) => row.map((z) => (math.multiply(z, ph) as math.Complex).re));
  };
  const smallest = (m: number[][]) => Math.min(...(math.eigs(m).values as number[]));
  assert.ok(smallest(reRot(-Math.PI / 4, 1e-9)) < 0);
  assert.ok(smallest(reRot(Math.PI / 8, 1e-9)) >= -1e-15);
  assert.equal(r.statements[2]!.legal, true);
});

/**
 * The one renderer of the step record: a typed step becomes a sentence (command line,
 * screen-reader text, card) and LaTeX (export, card formula). Nothing else in the
 * product composes or parses step sentences; the core only fills in typed fields.
 *
 * Example: renderStep({ kind: 'param', names: ['k'], domain: 'positive' }).text is
 * "k is a positive real number."
 */
import type { Basis, Formula, SampleBox, Step, StepOf } from '../evaluation.js';
import { DOMAIN_HELP } from '../language.js';
import { approx, complexApprox, complexApproxLatex, digits, piMultipleLatex, piMultipleText, pointText, scaledText } from './numbers.js';

export interface RenderedStep {
  /** The sentence in plain words, formulas in infix text. */
  text: string;
  /** The step's formula in LaTeX (math mode, without delimiters). */
  latex: string;
}

/** An exact number with its decimal where the text is not already one: 30*sqrt(3) (≈ 51.9615), 10. */
const exactNumberText = (b: { text: string; approx: number }) => (String(b.approx) === b.text ? b.text : `${b.text} (${approx(b.approx)})`);
const cap = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);
const list = (xs: readonly string[]) => (xs.length <= 1 ? xs.join('') : `${xs.slice(0, -1).join(', ')} and ${xs[xs.length - 1]}`);
const plural = (n: number, word: string) => `${n} ${word}${n === 1 ? '' : 's'}`;
const tex = (s: string) => `\\text{${s.replace(/[\\{}]/g, '')}}`;

/**
 * A name set in math: one letter italic (a variable), a longer name upright as one word
 * (never an italic product of letters); an underscore makes a subscript. The card, the
 * record's steps and the export all set names this way.
 */
export function nameLatex(name: string): string {
  const [head, ...rest] = name.split('_');
  const word = (w: string) => (/^[A-Za-z]$/.test(w) ? w : `\\mathrm{${w.replace(/[^A-Za-z0-9]/g, '')}}`);
  return rest.length ? `${word(head!)}_{${word(rest.join(''))}}` : word(head!);
}
const mathName = nameLatex;

function boxText(box: SampleBox): string {
  return box.map((b) => `${b.name} ${b.domain} with magnitudes log-spaced from ${digits(b.from, 2)} to ${digits(b.to, 2)}`).join('; ');
}

/** "proved on the whole declared domain" / "checked at 32 points of …, not proved". */
export function basisText(b: Basis): string {
  switch (b.kind) {
    case 'proved': return 'proved on the whole declared domain';
    case 'numeric': return 'decided numerically in double precision';
    case 'sampled': return `checked at ${plural(b.count, 'point')} (${boxText(b.box)}), not proved`;
  }
}

const matrixText = (m: Formula[][]) => `[${m.map((r) => `[${r.map((e) => e.text).join(', ')}]`).join(', ')}]`;
const matrixLatex = (m: Formula[][]) => `\\begin{pmatrix} ${m.map((r) => r.map((e) => e.latex).join(' & ')).join(' \\\\ ')} \\end{pmatrix}`;

const CONVERGENCE_WORDS = {
  absolute: 'absolutely convergent',
  oscillatory: 'oscillatory, defined by the i*epsilon prescription (the limit of A + epsilon*I as epsilon -> 0+)',
  divergent: 'divergent',
  piecewise: 'convergent only on part of the domain',
  unknown: 'of unknown convergence',
} as const;

function convergence(s: StepOf<'convergence'>): RenderedStep {
  const head = `${cap(CONVERGENCE_WORDS[s.verdict])}, ${basisText(s.basis)}`;
  const dir = s.direction ? `; the integrand grows along the real direction ≈ (${s.direction.map((x) => digits(x)).join(', ')})${s.at ? ` at ${pointText(s.at)}` : ''}` : '';
  const why: Record<StepOf<'convergence'>['reason'], string> = {
    sylvester: `: Re A is positive definite, its leading principal minors ${s.minors.map((m) => m.text).join(', ')} being positive (Sylvester's criterion)`,
    diagonal: ': a diagonal entry of Re A is negative',
    eigenvalues: `: eigenvalues of Re A ${s.realEigenvalues.map((x) => approx(x)).join(', ')}`,
    cholesky: `: Re A is positive definite, its Cholesky factorization succeeding with every pivot positive (smallest ${approx(s.smallestPivot ?? NaN)}; with this many variables the eigenvalues are not computed)`,
    'i-epsilon': ': Re A is only semidefinite, but A is nonsingular, so the integral is defined as the limit of A + epsilon*I as epsilon -> 0+',
    grows: ': Re A has a negative direction',
    'no-decay': ': Re A is singular and nothing makes the integrand decay along its kernel',
    'source-grows': ': Re A is only semidefinite and the real part of the linear term has a component along its kernel, so the integrand grows along the real line; the value below is the i*epsilon (analytic) one',
    changes: `: ${s.regions.map((r) => `${r.verdict} for ${r.condition.text}`).join('; ')}`,
    sampled: Object.keys(s.counts).length ? `: ${Object.entries(s.counts).map(([k, n]) => `${k} at ${n}`).join(', ')}` : '',
  };
  const bounds = s.boundaries.length ? `; boundary at ${s.boundaries.map(exactNumberText).join(', ')}` : '';
  const latex = s.verdict === 'absolute'
    ? (s.minors.length ? `\\operatorname{Re} A \\succ 0:\\quad ${s.minors.map((m, k) => `\\Delta_{${k + 1}} = ${m.latex}`).join(',\\ ')}` : '\\operatorname{Re} A \\succ 0')
    : s.verdict === 'oscillatory' ? '\\operatorname{Re} A \\succeq 0,\\ \\det A \\neq 0'
    : s.verdict === 'divergent' ? '\\operatorname{Re} A \\not\\succeq 0'
    : s.regions.length ? s.regions.map((r) => `${tex(r.verdict)}\\ (${r.condition.latex})`).join(';\\ ') : tex('convergence depends on the parameters');
  return { text: `${head}${why[s.reason]}${bounds}${dir}.`, latex };
}

function branch(s: StepOf<'branch'>): RenderedStep {
  if (s.rule === 'principal-function') {
    const [lo, hi] = s.argRange ?? [0, 0];
    const range = piMultipleText(lo) === piMultipleText(hi) ? `is ${piMultipleText(lo)}` : `lies between ${piMultipleText(lo)} and ${piMultipleText(hi)}`;
    const near = s.nearCut ? `; ${s.nearCut} of them lie within 0.1 rad of the cut, where a continuous branch could differ` : ', away from the cut';
    return {
      text: `${s.fn}(${s.argument?.text ?? ''}) is taken on the principal branch (cut on the negative real axis): the argument of ${s.argument?.text ?? ''} ${range} (${basisText(s.basis)})${near}.`,
      latex: `\\${s.fn === 'log' ? 'log' : 'sqrt'}\\ ${tex('principal')}`,
    };
  }
  const eig = s.eigenvalues.map((z) => `${complexApprox(z, 5)} (arg ${piMultipleText(z.arg)})`).join(', ');
  const sum = s.argumentSum === undefined ? '' : piMultipleText(s.argumentSum);
  const where = s.at ? ` at ${pointText(s.at)}` : '';
  let text: string;
  switch (s.rule) {
    case 'one-variable':
      text = 'With one variable det A is the coupling itself, in the closed right half plane, so its principal root is the continuous one';
      break;
    case 'two-variables':
      text = 'With two variables and Re A > 0 both eigenvalue arguments lie in (-pi/2, pi/2), so their sum lies in (-pi, pi) and the principal sqrt(det A) is the product of the principal roots on the whole domain';
      break;
    case 'pivots':
      text = `Re A > 0, so every L D L^T pivot of A has positive real part and det(A)^(1/2) is the product of the pivots' principal roots; their arguments sum to ${sum}, so the principal sqrt(det A) ${s.principal === 'right' ? 'is that product' : 'has the wrong sign: det(A)^(-1/2) = -1/sqrt(det A)'}`;
      break;
    case 'eigenvalues':
      text = `The eigenvalues of A${where} are ${eig}; their arguments sum to ${sum}, ${s.principal === 'right' ? 'inside (-pi, pi], so the principal sqrt(det A) is the product of the principal roots' : 'outside (-pi, pi], so the principal sqrt(det A) has the wrong sign: det(A)^(-1/2) = -1/sqrt(det A)'}`;
      break;
    case 'crossings':
      text = s.crossings.length
        ? `det A crosses the negative real axis (the principal cut) at ${s.crossings.map(exactNumberText).join(', ')}; the principal sqrt(det A) is ${s.regions.map((r) => `${r.holds ? 'right' : 'wrong'} for ${r.condition.text}`).join(' and ')}`
        : `det A does not cross the negative real axis inside the domain, so the sign found at one point holds everywhere: ${eig ? `${s.at && Object.keys(s.at).length ? `at ${pointText(s.at)} ` : ''}the eigenvalues of A are ${eig}, their arguments summing to ${sum}, so ` : ''}the principal sqrt(det A) is ${s.principal === 'right' ? 'the continuous branch' : 'minus the continuous branch'} on the whole domain`;
      break;
    case 'sampled':
      text = s.principal === 'right'
        ? 'The principal sqrt(det A) equals the product of principal roots of the eigenvalues at every sampled point'
        : s.principal === 'wrong'
          ? `The principal sqrt(det A) has the wrong sign at every sampled point: det(A)^(-1/2) = -1/sqrt(det A) there${eig ? `; for example${where} the eigenvalues are ${eig}, arguments summing to ${sum}` : ''}`
          : `The sheet changes inside the domain: the principal sqrt(det A) is right at some sampled points and wrong at others${eig ? ` (for example${where}, eigenvalues ${eig})` : ''}; the result is written with the product of the pivots' principal roots instead`;
      break;
  }
  const pivotWords = s.pivotsAgree === null ? '' : s.pivotsAgree ? ' The L D L^T pivots give the same root.' : ' The L D L^T pivots disagreed with the eigenvalues at some point, where the eigenvalues were used.';
  const latex = s.rule === 'pivots'
    ? `\\det(A)^{1/2} = \\prod_k d_k^{1/2}${s.argumentSum === undefined ? '' : `,\\quad \\sum_k \\arg d_k ${piMultipleLatex(s.argumentSum)}`}`
    : s.rule === 'crossings' ? (s.regions.map((r) => `${tex(r.holds ? 'principal right' : 'principal wrong')}\\ (${r.condition.latex})`).join(';\\ ') || '\\det(A)^{1/2}\\ \\text{principal}')
    : `\\det(A)^{1/2} = \\prod_k \\lambda_k^{1/2}${s.argumentSum === undefined ? '' : `,\\quad \\sum_k \\arg \\lambda_k ${piMultipleLatex(s.argumentSum)}`}`;
  return { text: `${text} (${basisText(s.basis)}).${pivotWords}`, latex };
}

const WRITTEN = {
  principal: 'with the principal square root of det A',
  negated: 'as minus the principal form, as the branch requires',
  pivots: 'with the principal roots of the L D L^T pivots (the continuous branch throughout)',
  fresnel: 'in the Fresnel form |det B|^(-1/2) exp(i*pi*sig/4)',
  numeric: 'from (2 pi)^(n/2) det(A)^(-1/2) exp(J^T A^-1 J / 2 + c) in double precision on the branch above',
  none: '',
} as const;

function result(s: StepOf<'result'>): RenderedStep {
  if (!s.formula) return { text: 'The integral diverges: no value.', latex: tex('divergent') };
  const value = s.value ? `; numerically ${complexApprox(s.value, 15)}` : s.scaled ? `; numerically ${scaledText(s.scaled, 12)}, beyond double precision, computed through its logarithm` : '';
  if (s.written === 'numeric') return { text: `${s.name} ${complexApprox(s.value ?? { re: NaN, im: NaN }, 15)}, ${WRITTEN.numeric}.`, latex: `${mathName(s.name)} ${complexApproxLatex(s.value ?? { re: NaN, im: NaN }, 15)}` };
  const pieces = s.pieces.length ? `; piecewise: ${s.pieces.map((p) => `${p.formula.text} for ${p.condition.text}`).join('; ')}` : '';
  const check = s.verified
    ? `this form is the continuous branch (${basisText(s.basis)})`
    : 'WARNING: no written form reproduced the continuous branch at every point checked; treat it with care';
  return { text: `${s.name} = ${s.formula.text}, written ${WRITTEN[s.written]}; ${check}${pieces}${value}.`, latex: `${mathName(s.name)} = ${s.formula.latex}` };
}

function expect(s: StepOf<'expect'>): RenderedStep {
  if (s.basis.kind === 'proved' && s.how !== 'sampled') {
    const c = s.counterexample;
    const example = c ? `; for example at ${Object.keys(c.at).length ? pointText(c.at) : 'the computed value'}, ${s.name} ${complexApprox(c.lhs, 12)} but the expected value is ${c.rhs ? complexApprox(c.rhs, 12) : 'not a finite number'}` : '';
    if (s.holds && s.how === 'identical') {
      return {
        text: `${s.name} = ${s.expected.text} holds, ${basisText(s.basis)}: the two sides are the same rational function of the parameters and of the values of exp, sinh, cosh, sin and cos in them (no branch enters).`,
        latex: `${mathName(s.name)} = ${s.expected.latex}`,
      };
    }
    if (s.holds && (s.how === 'exponential-form' || s.how === 'roots')) {
      return {
        text: `${s.name} = ${s.expected.text} holds, ${basisText(s.basis)}: ${s.how === 'roots' ? ROOTS_REDUCED : EXPONENTIAL_FORM}.`,
        latex: `${mathName(s.name)} = ${s.expected.latex}`,
      };
    }
    if (s.holds) {
      const why = s.how === 'continuous-sign'
        ? ': every square root in them has an argument with positive real part on the whole domain (shown exactly), so their ratio is continuous and its sign, read at one point of each connected piece of the domain, is +1 throughout'
        : '';
      return {
        text: `${s.name} = ${s.expected.text} holds, ${basisText(s.basis)}: both sides have the same square and exponent exactly, and the same sign wherever ${s.name} is defined${why}.`,
        latex: `${mathName(s.name)} = ${s.expected.latex}`,
      };
    }
    if (s.how === 'differs') {
      return { text: `${s.name} = ${s.expected.text} does not hold (${basisText(s.basis)}): the squares or the exponentials of the two sides differ as functions${example}.`, latex: `${mathName(s.name)} \\neq ${s.expected.latex}` };
    }
    if (s.how === 'continuous-sign') {
      return { text: `${s.name} = ${s.expected.text} does not hold (${basisText(s.basis)}): the two sides have the same square and opposite signs on the whole domain (every square root in them has an argument with positive real part there, so the sign of their ratio, read at one point of each connected piece, cannot change)${example}.`, latex: `${mathName(s.name)} = -(${s.expected.latex})` };
    }
    const where = s.regions.filter((r) => !r.holds).map((r) => r.condition.text).join(' or ');
    const ok = s.regions.filter((r) => r.holds).map((r) => r.condition.text).join(' or ');
    return {
      text: `${s.name} = ${s.expected.text} does not hold${where ? ` for ${where}` : ''}${ok ? ` (it holds for ${ok})` : ''}, ${basisText(s.basis)}: the two sides have the same square but opposite signs there, where a principal root of the expected form has crossed its cut${example}.`,
      latex: `${mathName(s.name)} \\neq ${s.expected.latex}${where ? `\\quad (${s.regions.filter((r) => !r.holds).map((r) => r.condition.latex).join(',\\ ')})` : ''}`,
    };
  }
  if (s.holds) {
    return {
      text: `${s.name} = ${s.expected.text} holds: ${s.exact ? 'the difference simplifies to 0 exactly, and ' : ''}the values agree (${basisText(s.basis)}; largest relative difference ${s.worst === null ? 'not finite' : approx(s.worst, 3)}).`,
      latex: `${mathName(s.name)} = ${s.expected.latex}`,
    };
  }
  const c = s.counterexample;
  return {
    text: `${s.name} = ${s.expected.text} does not hold${c ? `: at ${Object.keys(c.at).length ? pointText(c.at) : 'the computed value'}, ${s.name} ${complexApprox(c.lhs, 12)} but the expected value is ${c.rhs ? complexApprox(c.rhs, 12) : 'not a finite number'}` : ''}.`,
    latex: `${mathName(s.name)} \\neq ${s.expected.latex}`,
  };
}

function numericCheck(s: StepOf<'numeric-check'>): RenderedStep {
  const where = s.at && Object.keys(s.at).length ? ` at ${pointText(s.at)}` : '';
  if (s.refused === 'too-many-variables') {
    return { text: `The numeric check of a ${s.vars}-variable integral is out of reach: nested quadrature here goes up to three variables, and a coarser rule would give a poor number rather than a check.`, latex: tex('no numeric check') };
  }
  if (s.refused === 'no-contour') {
    return { text: `On the contour the record says, Re A is not positive definite${where}, and no further legal rotation of the variables by up to pi/4 makes it so: no numeric check.`, latex: tex('no numeric check') };
  }
  const contour = s.contour === 'rotated'
    ? `along the rotated contour of ${s.contourOf ?? s.name} (${s.contourLabels.join(', ')}), written as the rotated integrand over real variables`
    : 'along the real contour';
  if (s.timedOut) return { text: `The quadrature ${contour}${where} hit its time limit after ${s.evaluations} integrand evaluations; no value.`, latex: tex('time limit') };
  const rot = s.extraRotation
    ? `; the integral is oscillatory there, so the contour was turned further by the legal rotation ${s.extraRotation.vars.map((v, k) => `${v} -> exp(i*(${s.extraRotation!.angles[k]!.text}))*${v}`).join(', ')} (the swept family checked at ${s.extraRotation.checked} angles), where it converges absolutely`
    : '';
  const value = s.value ? complexApprox(s.value, 15) : 'no value';
  return {
    text: `${s.name}${where} by nested trapezoidal quadrature (on a box cut where |integrand| has fallen by e^-${digits(s.truncation, 3)} at every level, the step halved until two levels agree) over ${plural(s.vars, 'variable')} ${contour}${rot}: ${value}, error estimate ${approx(s.errorEstimate ?? NaN, 3)}, ${s.evaluations} integrand evaluations, ${s.timeMs} ms. The integrand was read by evaluation only (its exponent polarized into numbers and checked against the whole integrand at 5 random points, largest relative difference ${approx(s.integrandCheck, 3)}).`,
    latex: s.value ? `${mathName(s.name)} ${complexApproxLatex(s.value, 12)}` : tex('no value'),
  };
}

function numericAgreement(s: StepOf<'numeric-agreement'>): RenderedStep {
  if (!s.closed) return { text: `The closed form of ${s.name} has no value here (it diverges); nothing to agree with.`, latex: tex('disagrees') };
  const p = s.printed;
  const printed = p
    ? ` The printed formula evaluated as written (principal roots as printed) gives ${complexApprox(p.value, 15)}: relative difference ${approx(p.relativeDifference, 3)}, ${p.agrees ? 'agrees' : 'DISAGREES'}.`
    : '';
  const closedAgrees = s.relativeDifference !== null && s.relativeDifference <= s.tolerance;
  return {
    text: `Against the closed form on the continuous branch (${complexApprox(s.closed, 15)}): relative difference ${approx(s.relativeDifference ?? NaN, 3)}, ${closedAgrees ? 'within' : 'OUTSIDE'} the tolerance ${digits(s.tolerance)}.${printed} Verdict: ${s.agrees ? 'agrees' : 'disagrees'}.`,
    latex: tex(s.agrees ? 'agrees' : 'disagrees'),
  };
}

function rotation(s: StepOf<'rotation'>): RenderedStep {
  const wick = s.moves.some((m) => m.wick);
  const steepest = s.moves.some((m) => m.steepest);
  const words = s.moves.map((m) => `${m.variable} -> exp(i*(${m.angle.text}))*${m.variable}${m.wick ? `, the Wick rotation ${m.variable} = -i*tau of a time variable` : ''}${m.steepest ? `, the steepest-descent direction (where the coupling of ${m.variable} becomes real and positive)` : ''}`);
  return {
    text: `${wick ? 'Wick rotation: ' : steepest ? 'Rotation onto the steepest-descent direction: ' : 'Rotation: '}${words.join('; ')}. The swept family is x_j -> exp(i*t*theta_j)*x_j for t from 0 to 1.`,
    latex: s.moves.map((m) => `${m.variable} \\to e^{i ${m.angle.latex}}\\, ${m.variable}`).join(',\\ '),
  };
}

function legality(s: StepOf<'legality'>): RenderedStep {
  const range = s.range ? ` The allowed angles are ${s.range.text}; two allowed choices that differ by pi differ by the orientation of the contour, hence by a sign.` : '';
  if (s.defines) {
    return s.legal
      ? { text: `Allowed: the integral diverges on the real contour, so no sweep from it is involved; the rotated contour defines the integral, and it converges there (${basisText(s.basis)}).${range}`, latex: '\\operatorname{Re}\\left(D A D\\right) \\succeq 0' }
      : { text: `Not allowed: the integral diverges on the real contour and on the rotated one too, at once at the angle given (${basisText(s.basis)}). No rotated result.${range}`, latex: '\\operatorname{Re}\\left(D A D\\right) \\not\\succeq 0' };
  }
  if (s.regions.length) {
    const ok = s.regions.filter((r) => r.holds).map((r) => r.condition.text).join(' or ');
    const bad = s.regions.filter((r) => !r.holds).map((r) => r.condition.text).join(' or ');
    return {
      text: `Not allowed on the whole domain: the swept family stays free of growth only for ${ok}; for ${bad} it meets growth (${basisText(s.basis)}). No rotated result; turn by less, or state the parameter's range.${range}`,
      latex: s.regions.map((r) => `${r.holds ? '\\text{allowed}' : '\\text{not allowed}'}\\ (${r.condition.latex})`).join(';\\ '),
    };
  }
  const how = s.method === 'exact' ? `decided exactly (${basisText(s.basis)})` : `checked on a grid of ${s.count} angles of the sweep (${basisText(s.basis)})${s.legal ? '' : ', the first bad angle located by bisection'}`;
  if (s.legal) {
    return {
      text: `Allowed: Re(D A D) stays positive semidefinite on every contour of the swept family, so the integrand does not grow and the arcs at infinity do not contribute; ${how}.${range}`,
      latex: '\\operatorname{Re}\\left(D(t) A D(t)\\right) \\succeq 0,\\ t \\in [0, 1]',
    };
  }
  const fb = s.firstBad;
  const first = fb?.angle ? fb.angle.text : fb?.t === 0 ? 'the start of the sweep (t = 0+: Re A is singular there and the rotation turns its null direction into a growing one)' : fb?.t !== undefined ? `t ${approx(fb.t)} of the sweep (${Object.entries(fb.perVariable).map(([v, a]) => `${v} at ${a.text}`).join(', ')})` : 'an angle of the sweep';
  const at = s.at && Object.keys(s.at).length ? ` (at ${pointText(s.at)})` : '';
  const dir = s.direction ? `, along the real direction ≈ (${s.direction.map((x) => digits(x)).join(', ')})` : '';
  return { text: `Not allowed: the integrand grows on the swept family, first at ${first}${at}${dir}; ${how}. No rotated result.`, latex: '\\operatorname{Re}\\left(D A D\\right) \\not\\succeq 0' };
}

function continuation(s: StepOf<'continuation'>): RenderedStep {
  const path = s.path.map((pt) => (pt.length > 1 ? `(${pt.map((f) => f.text).join(', ')})` : pt[0]!.text)).join(' -> ');
  const fixed = Object.keys(s.fixed).length ? ` with ${pointText(s.fixed)}${s.chosen.length ? ` (${list(s.chosen)} chosen by the record: the simplest point of the domain)` : ''}` : '';
  return {
    text: `Continued ${s.name} along ${path}${fixed}: ${s.steps} adaptive steps (${s.refined} refined), eigenvalues of A ${s.eigenRoute ? 'followed at every step, each square root chosen continuous with the last' : 'followed at sampled steps; the square root of det A followed through the L D L^T pivots at every step'}; det A followed as a second route with its phase unwrapped (${s.routesAgree ? 'the two routes agree' : 'WARNING: the routes disagree'}).`,
    latex: '\\det(A)^{1/2}\\ \\text{followed continuously along the path}',
  };
}

function continuationEvent(s: StepOf<'continuation-event'>): RenderedStep {
  const at = pointText(s.at);
  switch (s.event) {
    case 'branch-point':
      return { text: `Branch point at ${at}, passed at distance ${approx(s.distance ?? NaN, 4)} on the ${s.side} of the path (det A = 0 there, a ${s.simple ? 'simple' : 'higher-order'} zero, located by Newton's method from the closest approach at ${pointText(s.closest)}).`, latex: '\\det A = 0' };
    case 'cut-crossed':
      return { text: `det A crosses the negative real axis (the principal cut of 1/sqrt(det A)) at ${at}, from ${s.fromAbove ? 'above' : 'below'}: the principal root jumps there, the continued one does not.`, latex: '\\arg \\det A = \\pm\\pi' };
    case 'convergence-lost':
      return {
        text: s.rotation
          ? `The real contour stops converging at ${at} (Re A loses positive definiteness); the common rotation x -> exp(i*theta)*x with theta ${approx(s.rotation.theta)} (allowed for theta in (${digits(s.rotation.from, 4)}, ${digits(s.rotation.to, 4)}), on a grid of 721 angles) keeps the integral defined just beyond.`
          : `The real contour stops converging at ${at}, and no common rotation angle keeps the integral defined just beyond (checked on a grid of 721 angles); the value is continued analytically only.`,
        latex: '\\operatorname{Re} A \\not\\succ 0',
      };
    case 'convergence-regained':
      return { text: `The real contour converges again from ${at}.`, latex: '\\operatorname{Re} A \\succ 0' };
  }
}

function sheet(s: StepOf<'sheet'>): RenderedStep {
  const words = s.sheet === 'principal'
    ? 'the principal sheet (the end value equals the closed form with the principal 1/sqrt(det A))'
    : 'minus the principal sheet (the end value is minus the closed form with the principal 1/sqrt(det A))';
  return {
    text: `At the end point ${pointText(s.at)} the continued sqrt(det A) ${complexApprox(s.continued, 10)} and the principal one ${complexApprox(s.principal, 10)}: ${s.name} ends on ${words}${s.onCut ? '; the end point lies on the cut itself, where "principal" means arg(det A) = pi' : ''}. ${s.name} ${complexApprox(s.value, 15)}${s.closed ? `, the closed form ${s.closed.text}` : ''}.`,
    latex: s.closed ? `${mathName(s.name)} = ${s.closed.latex}` : `${mathName(s.name)} ${complexApproxLatex(s.value, 12)}`,
  };
}

/** How an identity over hyperbolic functions and asinh is shown (cas/verdicts/expForm.ts). */
const EXPONENTIAL_FORM =
  'with sinh(u) = (exp(u) - exp(-u))/2, cosh(u) = (exp(u) + exp(-u))/2 and exp(k*asinh(y)) = (y + sqrt(y^2 + 1))^k for whole k (the principal asinh(y) is log(y + sqrt(y^2 + 1)) on its whole cut plane, so no branch choice enters), and each square root reduced by its square (sqrt(y^2 + 1), and sqrt(X) or X^(k/2) in the forms, X rational in the parameters), the two sides are the same rational function of the parameters and the remaining values';

/** How an identity with square roots only is shown (cas/verdicts/identity.ts, method `roots`). */
const ROOTS_REDUCED =
  'with each square root a symbol r reduced by its square, r^2 = X (sqrt(X), or X^(k/2) read as X^((k - 1)/2)*sqrt(X), X rational in the parameters; r^2 = X holds for the principal root as for any root, so no branch choice enters), the two sides are the same rational function of the parameters, these roots and the remaining values';

function comparison(s: StepOf<'comparison'>): RenderedStep {
  const ratio = s.ratio ? s.ratio.text : complexApprox(s.ratioValue, 12);
  const how = s.how === 'exponential-form' ? `: ${EXPONENTIAL_FORM}, up to this constant factor` : s.how === 'roots' ? `: ${ROOTS_REDUCED}, up to this constant factor` : s.how === 'values' ? ': the same rational function of the parameters and of the values of exp, sinh, cosh, sin and cos in them, up to this constant factor' : '';
  return {
    text: `${s.a}/${s.b} = ${ratio}${s.constant ? `, constant (${basisText(s.basis)}${how})` : `; not constant (${basisText(s.basis)})`}.`,
    latex: `\\frac{${mathName(s.a)}}{${mathName(s.b)}} ${s.ratio ? `= ${s.ratio.latex}` : complexApproxLatex(s.ratioValue, 12)}`,
  };
}

/** exp(i*pi*m/4) in its simplest exact form: 1, i, -1, -i, exp(i*pi/4), exp(3*i*pi/4), exp(-i*pi/4), ... */
export function quarterPhase(m: number): string {
  const r = ((m % 8) + 8) % 8;
  const named: Record<number, string> = { 0: '1', 2: 'i', 4: '-1', 6: '-i' };
  if (named[r]) return named[r]!;
  const s = r > 4 ? r - 8 : r;
  return s === 1 ? 'exp(i*pi/4)' : s === -1 ? 'exp(-i*pi/4)' : `exp(${s}*i*pi/4)`;
}

function comparisonVerdict(s: StepOf<'comparison-verdict'>): RenderedStep {
  switch (s.verdict) {
    case 'equal': return { text: 'Verdict: equal (ratio 1).', latex: `${mathName(s.a)} = ${mathName(s.b)}` };
    case 'phase': return {
      text: `Verdict: equal up to the constant phase ${s.phaseOverPiQuarter !== null ? `${quarterPhase(s.phaseOverPiQuarter)} (${s.phaseOverPiQuarter} times pi/4)` : `exp(i*theta), theta ${approx(s.phase ?? NaN, 8)}, not a multiple of pi/4`}.`,
      latex: s.phaseOverPiQuarter !== null ? `${mathName(s.a)} = e^{${s.phaseOverPiQuarter} i\\pi/4} ${mathName(s.b)}` : `${mathName(s.a)} = e^{i\\theta} ${mathName(s.b)}`,
    };
    case 'different': return {
      text: `Verdict: different${s.example ? `; for example at ${s.example.at ? pointText(s.example.at) : 'the computed values'} the ratio is ${complexApprox(s.example.ratio, 10)}` : ''}.`,
      latex: `${mathName(s.a)} \\neq ${mathName(s.b)}`,
    };
  }
}

function derived(s: StepOf<'derived'>): RenderedStep {
  const closed = s.closed
    ? ` = ${s.closed.text}; this form reproduces the branch-faithful value at ${plural(s.compared, 'point')}`
    : s.usesResults ? '; no closed form reproduced the branch-faithful value at every point checked, so the definition is kept as written' : '';
  return {
    text: `${s.name} = ${s.definition.text}${closed}${s.value ? `; numerically ${complexApprox(s.value, 15)}` : ''}.`,
    latex: `${mathName(s.name)} = ${(s.closed ?? s.definition).latex}`,
  };
}

function moment(s: StepOf<'moment'>): RenderedStep {
  if (s.grassmann) {
    return {
      text: `<${s.polynomial.text}> under ${s.under} = ${s.result.text}, by expanding in the Grassmann algebra and integrating by the Berezin rule in the order written, divided by the integral without it; the two-point function <theta_i theta_j> is ${matrixText(s.covariance)}; exact in rational arithmetic.`,
      latex: `\\langle ${s.polynomial.latex} \\rangle_{${s.under}} = ${s.result.latex}`,
    };
  }
  const mean = s.mean.every((m) => m.text === '0') ? 'zero mean' : `mean A^-1 J = (${s.mean.map((m) => m.text).join(', ')})`;
  const where = s.convergence === 'absolute' ? '' : s.convergence === 'oscillatory' ? ' (the weight is oscillatory: the average is defined by the same i*epsilon limit as the integral)' : ` (the weight's convergence is ${s.convergence}: the average holds where it converges)`;
  return {
    text: `<${s.polynomial.text}> under ${s.under} = ${s.result.text}, by Wick (Isserlis) contractions with covariance A^-1 = ${matrixText(s.covariance)} and ${mean}: ${plural(s.pairings, 'pairing')} after shifting by the mean; exact in rational arithmetic${where}.`,
    latex: `\\langle ${s.polynomial.latex} \\rangle_{${s.under}} = ${s.result.latex}`,
  };
}

function derivative(s: StepOf<'derivative'>): RenderedStep {
  const logs = s.logDerivatives.length ? `, with ${s.logDerivatives.map((l) => `d log ${l.name}/d${s.param} = ${l.formula.text}`).join('; ')}` : '';
  return {
    text: `${s.name} = d/d${s.param} (${s.of.text}) = ${s.result.text}, exactly by the chain rule${logs}; checked against central differences at ${plural(s.checks.count, 'point')} (largest relative difference ${approx(s.checks.worst, 3)}).`,
    latex: `${mathName(s.name)} = \\frac{\\partial}{\\partial ${s.param}} \\left(${s.of.latex}\\right) = ${s.result.latex}`,
  };
}

const MODE_RANGE = { 0: (n: string) => `${n} >= 0`, 1: (n: string) => `${n} >= 1`, all: (n: string) => `all integers ${n}` } as const;
const MODE_RANGE_TEX = { 0: (n: string) => `${n} \\geq 0`, 1: (n: string) => `${n} \\geq 1`, all: (n: string) => `${n} \\in \\mathbb{Z}` } as const;

function regularisation(s: StepOf<'regularisation'>): RenderedStep {
  const lam = `lambda_${s.index} = ${s.factor.text}`;
  const how = s.decided === 'sampled' ? ' (the sign of Im u read at sample points of the declared domain, not proved)' : '';
  const branch = {
    principal: 'lambda^-s = exp(-s*log(lambda)) with the principal logarithm of each linear factor and of the leading coefficient',
    upper: `every ${lam} lies in the upper half plane (Im u > 0${how}), and lambda^-s takes arguments in (0, pi): a cut along the negative imaginary axis, which no mode meets; on the other side (Im u < 0) the same product is 1 - exp(-2*pi*i*u)`,
    lower: `every ${lam} lies in the lower half plane (Im u < 0${how}), and lambda^-s takes arguments in (-pi, 0): a cut along the positive imaginary axis, which no mode meets; on the other side (Im u > 0) the same product is 1 - exp(2*pi*i*u)`,
  }[s.branch];
  return {
    text: `Choice: the product of ${lam} over ${MODE_RANGE[s.from](s.index)} diverges and is defined by zeta regularisation, prod lambda_${s.index} = exp(-zeta'(0)) with zeta(s) = sum lambda_${s.index}^-s continued from Re s large to s = 0 (Hurwitz zeta functions); ${branch}; zeta(0) = ${s.zetaAtZero.text}, the power a constant factor of lambda enters with. Another regularisation (a cutoff, or another splitting of the modes) can differ by a local factor.`,
    latex: `\\prod_{${MODE_RANGE_TEX[s.from](s.index)}} \\lambda_{${s.index}} := e^{-\\zeta'(0)},\\quad \\zeta(0) = ${s.zetaAtZero.latex}`,
  };
}

function factorisationText(f: NonNullable<StepOf<'mode-product'>['factorisation']>, leading: string, n: string): string {
  const parts = f.factors.map((x) => `(${x.factor.text})${x.power > 1 ? `^${x.power}` : ''}`).join(' * ');
  const how = `${f.repeated ? 'repeated factors by the square-free decomposition (gcd of P and dP/d${n}), ' : ''}factors of degree 1 and 2 found from numerical roots followed through the parameters and each confirmed by exact division, the product checked identically`;
  return `The closed forms are for factors of degree 1 and 2, so P is factored exactly over the rational functions of the parameters, P(${n}) = ${leading === '1' ? '' : `${leading} * `}${parts} (${how}). `;
}

function modeProduct(s: StepOf<'mode-product'>): RenderedStep {
  const n = s.index ?? 'n';
  const split = s.shifts.length ? `${s.leading.text === '1' ? '' : `${s.leading.text} * `}${s.shifts.map((b) => (b.text === '0' ? n : b.text.startsWith('-') ? `(${n} - ${b.text.slice(1)})` : `(${n} + ${b.text})`)).join(' * ')}` : s.leading.text;
  const uses = s.formulas.map((f) => ({
    lerch: 'Lerch\'s formula prod over n >= 0 of (n + b) = sqrt(2*pi)/Gamma(b)',
    reflection: 'the reflection formula Gamma(1 + x)*Gamma(1 - x) = pi*x/sin(pi*x)',
    'all-integers': 'zeta(s) = zeta(s, u) + exp(-+i*pi*s)*zeta(s, 1 - u) (Hurwitz) with zeta(0, a) = 1/2 - a and zeta\'(0, a) = log(Gamma(a)/sqrt(2*pi))',
  }[f]));
  const anomaly = {
    linear: `The factor is linear in ${n}, so no multiplicative anomaly arises`,
    'split-polynomial': 'No multiplicative anomaly: for a polynomial in n in one dimension the regularised product of P equals leading^zeta(0) times the product of the regularised products of its linear factors (the Hurwitz expansion of zeta_P(s) gives no extra term; confirmed numerically against the zeta function of P itself in the tests, e.g. for (n + 0.3)(n + 1.7) and n^2 + a^2). In higher dimensions, or for operators rather than sequences, such a splitting can carry a multiplicative anomaly',
    'all-integers': `Over all integers the factor is linear in ${n} and zeta(0) = 0, so a constant factor of the modes does not change the product and no multiplicative anomaly arises`,
    'factored-polynomial': 'No multiplicative anomaly: for polynomial factors the zeta-regularised product over n of prod_j (n + b_j) equals the product of the regularised products prod_j sqrt(2*pi)/Gamma(b_j) (S. Mizuno, generalised Lerch formulas), so the product of P is leading^zeta(0) times the products of its monic factors, with zeta(0) that of the whole sequence P(n) (not of any one factor: a constant c of every mode enters as c^zeta_P(0)); confirmed numerically against the zeta function of P itself in the tests',
    'all-integers-even': 'Over all integers the modes split into m >= 0 and m = -n with n >= 1 (zeta(s) is the sum of the two halves), each half a product of polynomial factors without multiplicative anomaly (S. Mizuno); for even degree the modes point the same way as m -> +inf and m -> -inf, the leading coefficient enters with zeta(0) = 0, and each shift b gives sqrt(2*pi)/Gamma(b) * sqrt(2*pi)/Gamma(1 - b) = 2*sin(pi*b). Splitting P over all integers into factors of lower degree and multiplying their products over all integers is not the same in general (the multiplicative anomaly of first-order factors)',
    'all-integers-quadratic': 'Over all integers zeta(s) = q^-s + 2*zeta_{n>=1}(s) for P = c*(n^2 + q), so zeta(0) = 0 and P is not split. Warning, multiplicative anomaly: the regularised products of the linear factors n + x and n - x (x^2 = -q, Im x > 0) multiply to (1 - exp(2*pi*i*x))^2, which is this product times exp(2*pi*i*x), not this product; the product of the quadratic is the zeta-regularised determinant of the second-order operator (-d^2/dt^2 + y^2 on a circle of length 2*pi, periodic, for q = y^2), the product of the linear ones that of the two first-order operators',
  }[s.anomaly];
  const v = s.value ? ` ${complexApprox(s.value, 15)}` : '';
  return {
    text: `${s.factorisation ? factorisationText(s.factorisation, s.leading.text, n) : ''}P(${n}) = ${split}; by ${list(uses)}, ${s.name} = ${s.result.text}${v}, exactly. ${anomaly}.`,
    latex: `${mathName(s.name)} = ${s.result.latex}`,
  };
}

function functionalDeterminant(s: StepOf<'functional-determinant'>): RenderedStep {
  const op = `-d^2/dt^2 + ${s.potential.text}`;
  const where = s.shape === 'interval'
    ? `on [0, ${s.length.text}] with Dirichlet ends, as the ratio det(${op})/det(-d^2/dt^2) = y(${s.length.text})/${/^[\w.]+$/.test(s.length.text) ? s.length.text : `(${s.length.text})`} with y'' = V y, y(0) = 0, y'(0) = 1 (Gel'fand-Yaglom)`
    : `on a circle of length ${s.length.text}, ${s.conditions}, zeta-regularised: det = ${s.conditions === 'periodic' ? 'tr M - 2' : 'tr M + 2'} with M the monodromy of y'' = V y over one turn (for V = w^2, ${s.conditions === 'periodic' ? '4*sinh(beta*w/2)^2' : '4*cosh(beta*w/2)^2'})`;
  const value = s.value ? complexApprox(s.value, 15) : '';
  const res = s.zeroMode
    ? `= 0: the constant is a zero mode (it solves the equation with these ends); removed, the determinant of the other modes is det' = ${s.zeroMode.reduced.text} (the limit of 4*sinh(beta*w/2)^2/w^2 as w -> 0), exactly`
    : s.method === 'exact'
    ? `= ${s.result?.text ?? ''}${value ? ` ${value}` : ''}, exactly (V constant; the formula is even in sqrt(V), so no branch of the square root is chosen)`
    : `${value}, by integrating y'' = V y with fourth-order Runge-Kutta, halving the step until two solves agree (${plural(s.ode?.steps ?? 0, 'step')}, relative difference ${approx(s.ode?.difference ?? 0, 3)}; numeric, not proved)`;
  return {
    text: `${s.name}: det(${op}) ${where} ${res}.`,
    latex: `${mathName(s.name)} = ${s.result?.latex ?? (s.value ? complexApproxLatex(s.value, 12) : '')}`,
  };
}

/** The time-sliced determinant: the matrix, how its determinant was found, the branch of theta, the check. */
function timeSlicing(s: StepOf<'time-slicing'>): RenderedStep {
  const N = /^[\w.]+$/.test(s.slices.text) ? s.slices.text : `(${s.slices.text})`;
  const L = /^[\w.]+$/.test(s.length.text) ? s.length.text : `(${s.length.text})`;
  const V = s.potential.text;
  const parts: string[] = [];
  // eps = L/N, reduced when both are whole numbers (3/6 is written 1/2)
  const gcd = (a: number, b: number): number => (b ? gcd(b, a % b) : a);
  const eps = /^\d+$/.test(s.length.text) && /^\d+$/.test(s.slices.text)
    ? (() => { const [a, b] = [Number(s.length.text), Number(s.slices.text)]; const g = gcd(a, b) || 1; return b / g === 1 ? `${a / g}` : `${a / g}/${b / g}`; })()
    : `${L}/${N}`;
  const diag = s.method === 'exact' ? '2 + eps^2*V' : '2 + eps^2*V(t_j)';
  // the matrix's size: a number when N is one
  const size = (k: number) => (/^\d+$/.test(s.slices.text) ? `${Number(s.slices.text) - k} x ${Number(s.slices.text) - k}` : k ? `(${N} - ${k}) x (${N} - ${k})` : `${N} x ${N}`);
  if (s.shape === 'interval') {
    parts.push(`${s.name}: -d^2/dt^2 + ${V} on [0, ${s.length.text}] with Dirichlet ends, cut into ${N} slices of eps = ${eps}: the sliced action sum_j ((x_(j+1) - x_j)^2/(2*eps) + eps*V*x_j^2/2) with x_0 = x_${N} = 0 is x^T M x/(2*eps), M the ${size(1)} tridiagonal matrix with ${diag} on the diagonal and -1 beside it`);
    parts.push(s.method === 'exact'
      ? `its determinant by the recursion D_n = (2 + eps^2*V)*D_(n-1) - D_(n-2), D_0 = 1, D_(-1) = 0, whose characteristic roots are exp(+-theta) with cosh(theta) = 1 + eps^2*V/2, so D_n = sinh((n + 1)*theta)/sinh(theta); at V = 0, D_(${N}-1) = ${N}, and the ratio det M(V)/det M(0) = sinh(${N}*theta)/(${N}*sinh(theta)) is the sliced counterpart of det(-d^2 + V)/det(-d^2)`
      : `t_j = j*eps, its determinant by elimination, divided by det M(0) = ${N}`);
  } else {
    const corner = s.conditions === 'periodic' ? '-1' : '+1';
    parts.push(`${s.name}: -d^2/dt^2 + ${V} on a circle of length ${s.length.text}, ${s.conditions}, cut into ${N} slices of eps = ${eps}: M is the ${size(0)} circulant with ${diag} on the diagonal, -1 beside it and ${corner} in the corners (x_(j+${N}) = ${s.conditions === 'periodic' ? 'x_j' : '-x_j'})`);
    parts.push(s.zeroMode
      ? `at V = 0 its eigenvalues are 4*sin(pi*k/${N})^2, k = 0, ..., ${N} - 1, and k = 0 (the constant) is a zero mode; removed, det' = prod over k = 1..${N}-1 of 4*sin(pi*k/${N})^2 = ${N}^2 (the functional det' = beta^2 of a circle of length beta normalises the removed mode differently, so the two are not compared)`
      : s.method === 'exact'
      ? `its eigenvalues are 2 + eps^2*V - 2*cos(2*pi*k/${N}) = 4*sinh(theta/2)^2 + 4*sin(pi*k/${N})^2, k = ${s.conditions === 'periodic' ? '0' : '1/2'}, ..., ${s.conditions === 'periodic' ? `${N} - 1` : `${N} - 1/2`}, with cosh(theta) = 1 + eps^2*V/2, and their product is ${s.conditions === 'periodic' ? '2*cosh(N*theta) - 2 = 4*sinh(N*theta/2)^2' : '2*cosh(N*theta) + 2 = 4*cosh(N*theta/2)^2'}`
      : `t_j = j*eps, its determinant by elimination`);
  }
  if (s.theta && s.thetaBranch) {
    parts.push(s.thetaBranch === 'real'
      ? `Choice: theta = ${s.theta.text} (sinh(theta/2) = eps*sqrt(V)/2), real and >= 0 since V >= 0 on the whole domain`
      : `Choice: theta = ${s.theta.text} (sinh(theta/2) = eps*sqrt(V)/2) with principal asinh and sqrt; V may be negative or complex here, but the result is a polynomial in cosh(theta) (Chebyshev), so every theta with cosh(theta) = 1 + eps^2*V/2 gives the same value and no branch enters the result`);
  }
  const v = s.value ? ` ${complexApprox(s.value, 15)}` : '';
  parts.push(s.result ? `${s.name} = ${s.result.text}${v}${s.method === 'exact' ? ', exactly' : ''}` : `${s.name}${v} (numeric, not proved)`);
  if (s.checks) parts.push(`checked against ${s.zeroMode ? 'N times a cofactor of the explicit matrix (matrix-tree theorem) by LU elimination' : 'the determinant of the explicit matrix by LU elimination'} at ${plural(s.checks.slices.length, 'slice count')} (${s.checks.slices.join(', ')}) and ${plural(s.checks.points, 'point')}: worst relative difference ${approx(s.checks.worst, 3)}`);
  return {
    text: `${parts.join('; ')}.`,
    latex: `${mathName(s.name)} = ${s.result?.latex ?? (s.value ? complexApproxLatex(s.value, 12) : '')}`,
  };
}

function variables(s: StepOf<'variables'>): RenderedStep {
  const parts: string[] = [];
  if (s.complex.length) parts.push(`${list(s.complex.map((z) => z.name))} ${s.complex.length > 1 ? 'are complex variables' : 'is a complex variable'}, written ${s.complex.map((z) => `${z.name} = ${z.re} + i*${z.im}`).join(', ')} with the measure d^2z = dx dy for each (as forms dz^dzbar = -2i dx^dy, so a convention with dz dzbar multiplies the result by (-2i)^${s.complex.length}, and one with d^2z = 2 dx dy by 2^${s.complex.length})`);
  if (s.grassmann.length) parts.push(`${list(s.grassmann)} ${s.grassmann.length > 1 ? 'are Grassmann variables' : 'is a Grassmann variable'}, integrated by the Berezin rule (integral of theta dtheta = 1) in the order written: the leftmost outermost, d${s.grassmann[0]} ... d${s.grassmann[s.grassmann.length - 1]}`);
  return { text: `${parts.join('; ')}.`, latex: tex('measure convention') };
}

function berezin(s: StepOf<'berezin'>): RenderedStep {
  const c = s.constant ? ` times exp(${s.constant.text})` : '';
  return {
    text: `The exponent is -1/2 theta^T A theta${s.constant ? ' + c' : ''} in theta = (${s.vars.join(', ')}), with A = ${matrixText(s.A)} antisymmetric; the Berezin integral in the order written is Pf(A)${c} = ${s.pfaffian.text}, exactly (no convergence question arises).`,
    latex: `\\int \\prod d\\theta\\, e^{-\\frac12 \\theta^T A \\theta} = \\operatorname{Pf}(A) = ${s.pfaffian.latex}`,
  };
}

function limit(s: StepOf<'limit'>): RenderedStep {
  const to = s.to.text;
  const arrow = `${s.param} -> ${to}`;
  const f = s.formula;
  const sym = s.outcome === 'asymptotic' ? '~' : '=';
  const latexTo = s.to.latex;
  const lhs = s.outcome === 'asymptotic' ? `${s.name} \\sim` : `\\lim_{${s.param} \\to ${latexTo}} ${s.name} =`;
  const checks = s.checks ? ` (checked numerically at ${plural(s.checks.count, 'point')}, largest relative difference ${approx(s.checks.worst, 3)})` : '';
  switch (s.outcome) {
    case 'unknown':
      return { text: `As ${arrow}, the limit of ${s.name} is unknown: ${s.reason ? `the exact expansion could not decide it (${s.reason})` : 'no exact expansion was found'}${s.value ? `; near the end point the value is ${complexApprox(s.value, 10)}, which is not a limit` : ''}.`, latex: `\\lim_{${s.param} \\to ${latexTo}} ${mathName(s.name)}\\ ${tex('unknown')}` };
    case 'divergent':
      return { text: `As ${arrow}, ${s.name} diverges${f ? ` like ${f.text}` : ''} (${basisText(s.basis)}).`, latex: `${mathName(s.name)} \\sim ${f?.latex ?? '\\infty'}` };
    case 'oscillating':
      return { text: `As ${arrow}, ${s.name} has no limit: it oscillates${f ? ` like ${f.text}` : ''} (${basisText(s.basis)}).`, latex: tex('no limit') };
    default: {
      const method: Record<StepOf<'limit'>['method'], string> = {
        substitution: `substituting ${s.param} = ${to} in the closed form`,
        'algebra-limit': 'the algebra package\'s limit',
        recognised: 'a constant recognised from its values and confirmed at a larger value (checked, not proved)',
        'read-off': 'values read off at large parameter (checked numerically only)',
        logarithmic: 'logarithmic growth read off values at large parameter (checked numerically only)',
        expansion: `an exact expansion (${basisText(s.basis)})`,
        none: '',
      };
      const corr = s.correction ? `; next correction ${s.correction.formula ? s.correction.formula.text : `like ${s.param}^(${digits(s.correction.power, 4)})`}` : '';
      const cterm = (s.constantTerm ? `; the constant term is ${complexApprox(s.constantTerm, 10)}` : '') + (s.rate ? `; it is approached like ${s.rate.text}` : '')
        + (s.remainder ? `; the rest is exponentially small, O(${s.remainder.order.text})${s.remainder.bound ? `, at most ${s.remainder.bound.text} in absolute value once each of its terms is below 1/2` : ''}` : '');
      return {
        text: `As ${arrow}, ${s.name} ${sym} ${f?.text ?? complexApprox(s.value ?? { re: NaN, im: NaN }, 10)}, by ${method[s.method]}${checks}${corr}${cterm}.`,
        latex: `${lhs} ${f?.latex ?? ''}${s.remainder ? ` + O\\left(${s.remainder.order.latex}\\right)` : ''}`,
      };
    }
  }
}

function poissonResummation(s: StepOf<'poisson-resummation'>): RenderedStep {
  const g = s.constant ? ` times exp(${s.constant.text})` : '';
  const re = s.realPart.kind === 'proved' ? 'Re a > 0 on the whole declared domain (proved)' : `Re a > 0 (${basisText(s.realPart)})`;
  const v = s.value ? ` ${complexApprox(s.value, 15)}` : '';
  return {
    text: `The sum over all integers ${s.index} of ${s.term.text} is sum_${s.index} exp(-pi*a*${s.index}^2 + 2*pi*i*b*${s.index})${g} with a = ${s.a.text}, b = ${s.b.text}; ${re}, so it converges absolutely. Poisson resummation: sum_n exp(-pi*a*n^2 + 2*pi*i*b*n) = a^(-1/2) * sum_m exp(-pi*(m - b)^2/a). Branch: a^(-1/2) is the principal root, because both sides are analytic in a on Re a > 0, the principal root is continuous there (Re a > 0 keeps a off the negative real axis), and they agree for real a > 0 (the Fourier transform of a Gaussian).${v ? ` Value${v}.` : ''}`,
    latex: `\\sum_{${s.index}\\in\\mathbb{Z}} e^{-\\pi a ${s.index}^2 + 2\\pi i b ${s.index}} = a^{-1/2} \\sum_{m\\in\\mathbb{Z}} e^{-\\pi (m - b)^2/a},\\quad a = ${s.a.latex},\\ b = ${s.b.latex}`,
  };
}

function smallParameterForm(s: StepOf<'small-parameter-form'>): RenderedStep {
  const m0 = s.nearest === null ? 'm0 the integer nearest Re b - Im b*Im(1/a)/Re(1/a) (where |exp(-pi*(m - b)^2/a)| peaks)' : `m0 = ${s.nearest}`;
  const symbols = `s = Re(1/a)${s.bound.text.includes('y') ? ', y = Im b, r = |1/a|' : ''}`;
  const bv = s.boundValue !== null ? ` (here ${approx(s.boundValue, 6)})` : '';
  return {
    text: `For small a (Re(1/a) large): ${s.name} = ${s.leading.text} + R*exp(g)*a^(-1/2), the leading term of the resummed side (${m0}, g the n-free part of the exponent); the other terms m != m0 make up R, |R| <= ${s.bound.text}, ${symbols}${bv}, from the distance of every other m to the peak, summed as a geometric series on each side. The remainder is exponentially small in 1/a: beyond all orders of any power of a.`,
    latex: `${mathName(s.name)} \\approx ${s.leading.latex},\\quad |R| \\le ${s.bound.latex}`,
  };
}

function modular(s: StepOf<'modular'>): RenderedStep {
  const what = s.of === 'eta'
    ? `eta(tau) = (-i*tau)^(-1/2) * eta(-1/tau) at tau = ${s.argument.text} (modular transformation; -1/tau = ${s.dual.text}). Branch: (-i*tau)^(-1/2) is the principal root, because Re(-i*tau) = Im tau > 0, and both sides are analytic on the upper half plane and agree on the imaginary axis; eta(-1/tau) = exp(2*pi*i*(-1/tau)/24) * prod (1 - q'^n), q' = exp(2*pi*i*(-1/tau)), and |prod - 1| <= 4*|q'| once |q'| <= 1/4`
    : `the sum ${s.label} by Poisson resummation at a = ${s.argument.text} (1/a = ${s.dual.text}): its m = 0 term, with the other terms bounded by 4*exp(-pi*Re(1/a)) relative once exp(-2*pi*Re(1/a)) <= 1/2`;
  return {
    text: `In the expansion, ${what}: ${s.label} = ${s.leading.text} * (1 + delta) with |delta| <= ${s.bound.text}, beyond all orders.`,
    latex: `${s.of === 'eta' ? '\\eta' : s.label} = ${s.leading.latex}\\,(1 + \\delta),\\quad |\\delta| \\le ${s.bound.latex}`,
  };
}

function odeCheck(s: StepOf<'ode-check'>): RenderedStep {
  const what = s.conditions === 'dirichlet' ? "y2(L)/L with y2(0) = 0, y2'(0) = 1 (Gel'fand-Yaglom)" : `tr M ${s.conditions === 'periodic' ? '- 2' : '+ 2'} from the monodromy matrix M over one turn`;
  return {
    text: `Checked${Object.keys(s.at).length ? ` at ${pointText(s.at)}` : ''} by solving y'' = V(t) y with fourth-order Runge-Kutta (${plural(s.steps, 'step')}; ${approx(s.stepDifference, 2)} from the solve with half as many), independently of the closed form: ${what} ${complexApprox(s.value, 12)} against the closed form ${complexApprox(s.closed, 12)}, relative difference ${approx(s.relativeDifference, 3)}, ${s.agrees ? 'within' : 'NOT within'} the tolerance ${approx(s.tolerance, 2)}.`,
    latex: `${mathName(s.name)} ${complexApproxLatex(s.value, 12)}\\ ${tex(s.agrees ? 'agrees' : 'disagrees')}`,
  };
}

function seriesCheck(s: StepOf<'series-check'>): RenderedStep {
  return {
    text: `Checked${Object.keys(s.at).length ? ` at ${pointText(s.at)}` : ''} from the definitions (partial sums and products, no resummation or modular transformation; ${plural(s.terms, 'term')}, the last of size ${approx(s.lastTerm, 2)}): ${complexApprox(s.value, 12)} against the closed form ${complexApprox(s.closed, 12)}, relative difference ${approx(s.relativeDifference, 3)}, ${s.agrees ? 'within' : 'NOT within'} the tolerance ${approx(s.tolerance, 2)}.`,
    latex: `${mathName(s.name)} ${complexApproxLatex(s.value, 12)}\\ ${tex(s.agrees ? 'agrees' : 'disagrees')}`,
  };
}

export function renderStep(step: Step): RenderedStep {
  switch (step.kind) {
    case 'param': return {
      text: `${list(step.names)} ${step.names.length > 1 ? 'are each' : 'is'} ${step.integer ? 'a positive integer (1, 2, 3, ...)' : DOMAIN_HELP[step.domain]}.`,
      latex: `${step.names.join(', ')} \\in ${{ positive: '(0, \\infty)', negative: '(-\\infty, 0)', real: '\\mathbb{R}', complex: '\\mathbb{C}', nonzero: '\\mathbb{R} \\setminus \\{0\\}', integer: '\\{1, 2, 3, \\ldots\\}' }[step.integer ? 'integer' : step.domain]}`,
    };
    case 'note': return { text: step.text, latex: '' };
    case 'quadratic-form': {
      const how = { derivatives: 'by exact differentiation (A = -d^2S/dx dx, J = dS/dx, c = S at x = 0), confirmed against the term-by-term expansion', expansion: 'from the term-by-term expansion', numbers: 'read off by expanding the exponent', exact: 'by exact expansion in rational arithmetic (every entry a rational function of the parameters)' }[step.source];
      return {
        text: `${step.rotated ? 'New coupling: ' : ''}The exponent is S = -1/2 x^T A x + J^T x + c in x = (${step.vars.join(', ')}), with A = ${matrixText(step.A)}, J = (${step.J.map((e) => e.text).join(', ')}), c = ${step.c.text}, ${how}.`,
        latex: `A = ${matrixLatex(step.A)},\\quad J = \\begin{pmatrix} ${step.J.map((e) => e.latex).join(' \\\\ ')} \\end{pmatrix},\\quad c = ${step.c.latex}`,
      };
    }
    case 'convergence': return convergence(step);
    case 'branch': return branch(step);
    case 'fresnel-phase': {
      const sig = step.signature.positive - step.signature.negative;
      return {
        text: `A = -iB with B real symmetric of signature (${step.signature.positive}, ${step.signature.negative}), sig B = ${sig} (${basisText(step.basis)}): det(A)^(-1/2) = |det B|^(-1/2) exp(i*pi*sig/4), phase ${quarterPhase(sig)}.`,
        latex: `\\det(A)^{-1/2} = \\left|\\det B\\right|^{-1/2} e^{i\\pi \\operatorname{sig}(B)/4},\\quad \\operatorname{sig}(B) = ${sig}`,
      };
    }
    case 'result': return result(step);
    case 'expect': return expect(step);
    case 'numeric-check': return numericCheck(step);
    case 'numeric-agreement': return numericAgreement(step);
    case 'rotation': return rotation(step);
    case 'legality': return legality(step);
    case 'jacobian': return { text: `Jacobian dx = ${step.factor.text} dy (exp(i*(${step.totalAngle.text})), the product of the rotation factors).`, latex: `dx = ${step.factor.latex}\\, dy` };
    case 'continuation': return continuation(step);
    case 'continuation-event': return continuationEvent(step);
    case 'sheet': return sheet(step);
    case 'comparison': return comparison(step);
    case 'comparison-verdict': return comparisonVerdict(step);
    case 'derived': return derived(step);
    case 'limit': return limit(step);
    case 'moment': return moment(step);
    case 'derivative': return derivative(step);
    case 'variables': return variables(step);
    case 'berezin': return berezin(step);
    case 'regularisation': return regularisation(step);
    case 'mode-product': return modeProduct(step);
    case 'functional-determinant': return functionalDeterminant(step);
    case 'time-slicing': return timeSlicing(step);
    case 'poisson-resummation': return poissonResummation(step);
    case 'small-parameter-form': return smallParameterForm(step);
    case 'modular': return modular(step);
    case 'series-check': return seriesCheck(step);
    case 'ode-check': return odeCheck(step);
  }
}

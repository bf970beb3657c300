/**
 * The evaluation record of a worksheet: what the computation core returns, what
 * the server sends to the client, what the command line tool prints with --json.
 * shared/ imports nothing from src/, server/ or cas/.
 */
import { z } from 'zod';
import { diagramData } from './diagram.js';
import { DOMAINS } from './language.js';

export const STATEMENT_KINDS = [
  'param', 'integral', 'expect', 'note', 'rotate', 'continue', 'compare', 'verify', 'let', 'limit', 'moment', 'derivative', 'product', 'determinant', 'sliced', 'sum', 'invalid',
] as const;
export type StatementKind = (typeof STATEMENT_KINDS)[number];

export { DOMAINS, type Domain } from './language.js';

export const complexValue = z.object({ re: z.number(), im: z.number() });
export type ComplexValue = z.infer<typeof complexValue>;

/** An eigenvalue (or pivot) with its argument in radians, in (-pi, pi]. */
export const polarValue = z.object({ re: z.number(), im: z.number(), arg: z.number() });
export type PolarValue = z.infer<typeof polarValue>;

/** A value outside double range, as mantissa times a power of ten (mantissa modulus in [1, 10)). */
export const scaledValue = z.object({ mantissa: complexValue, exponent10: z.number().int() });
export type ScaledValue = z.infer<typeof scaledValue>;

/** A formula as the core prints it: infix text and LaTeX of the same expression. */
export const formula = z.object({ text: z.string(), latex: z.string() });
export type Formula = z.infer<typeof formula>;

/** An exact real number (a boundary such as 30*sqrt(3)) with its decimal value. */
export const exactNumber = formula.extend({ approx: z.number() });
export type ExactNumber = z.infer<typeof exactNumber>;

/** Parameter values of a point. */
export const pointValues = z.record(z.string(), complexValue);
export type PointValues = z.infer<typeof pointValues>;

/** The part of a declared domain that was sampled: log-spaced magnitudes per parameter. */
export const sampleBox = z.array(z.object({ name: z.string(), domain: z.enum(DOMAINS), from: z.number(), to: z.number() }));
export type SampleBox = z.infer<typeof sampleBox>;

/**
 * How a verdict was reached: proved on the whole declared domain; decided in double
 * precision at a point without parameters; or checked at `count` points of a box.
 */
export const basis = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('proved') }),
  z.object({ kind: z.literal('numeric') }),
  z.object({ kind: z.literal('sampled'), count: z.number(), agreeing: z.number(), box: sampleBox }),
]);
export type Basis = z.infer<typeof basis>;

/** A part of the domain with its exact condition, for piecewise verdicts and results. */
export const region = z.object({ condition: formula, holds: z.boolean() });

const CONVERGENCE_VERDICTS = ['absolute', 'oscillatory', 'divergent', 'piecewise', 'unknown'] as const;

/** The step kinds, each with the numbers that decided it; renderStep (shared/record) words them. */
export const step = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('param'), names: z.array(z.string()), domain: z.enum(DOMAINS), /** declared `positive integer` */ integer: z.boolean().optional() }),
  z.object({ kind: z.literal('note'), text: z.string() }),
  z.object({
    kind: z.literal('quadratic-form'),
    vars: z.array(z.string()),
    A: z.array(z.array(formula)), J: z.array(formula), c: formula,
    /** derivatives: exact derivatives confirmed by the expansion; expansion: term by term; numbers: no parameters. */
    source: z.enum(['derivatives', 'expansion', 'numbers', 'exact']),
    /** Set on a rotated result: the coupling after the rotation. */
    rotated: z.boolean().default(false),
  }),
  z.object({
    kind: z.literal('convergence'),
    verdict: z.enum(CONVERGENCE_VERDICTS),
    /** sylvester: leading minors of Re A; eigenvalues / cholesky: numbers of Re A; i-epsilon: Re A semidefinite, A nonsingular; grows: a real direction of growth; no-decay: Re A singular with no oscillation to define it; source-grows: a real source along an oscillatory direction; changes: the verdict changes inside the domain. */
    reason: z.enum(['sylvester', 'diagonal', 'eigenvalues', 'cholesky', 'i-epsilon', 'grows', 'no-decay', 'source-grows', 'changes', 'sampled']),
    basis,
    minors: z.array(formula).default([]),
    realEigenvalues: z.array(z.number()).default([]),
    smallestPivot: z.number().optional(),
    direction: z.array(z.number()).optional(),
    at: pointValues.optional(),
    regions: z.array(region.extend({ verdict: z.enum(CONVERGENCE_VERDICTS) })).default([]),
    boundaries: z.array(exactNumber).default([]),
    counts: z.record(z.string(), z.number()).default({}),
  }),
  z.object({
    kind: z.literal('branch'),
    /** right: the principal sqrt(det A) is the continuous branch everywhere; wrong: nowhere; piecewise: see regions. */
    principal: z.enum(['right', 'wrong', 'piecewise', 'unknown']),
    /** one-variable / two-variables: a rule that holds on the whole domain; eigenvalues, pivots: numbers at `at`; crossings: exact cut crossings; sampled. */
    rule: z.enum(['one-variable', 'two-variables', 'eigenvalues', 'pivots', 'crossings', 'sampled', 'principal-function']),
    basis,
    eigenvalues: z.array(polarValue).default([]),
    pivots: z.array(polarValue).default([]),
    argumentSum: z.number().optional(),
    pivotsAgree: z.boolean().nullable().default(null),
    crossings: z.array(exactNumber).default([]),
    regions: z.array(region).default([]),
    at: pointValues.optional(),
    /** principal-function: a sqrt or log of a derived quantity, with the argument range seen. */
    fn: z.enum(['sqrt', 'log']).optional(),
    argument: formula.optional(),
    argRange: z.tuple([z.number(), z.number()]).optional(),
    nearCut: z.number().optional(),
  }),
  z.object({
    kind: z.literal('fresnel-phase'),
    signature: z.object({ positive: z.number(), negative: z.number() }),
    realEigenvalues: z.array(z.number()).default([]),
    basis,
  }),
  z.object({
    kind: z.literal('result'),
    name: z.string(),
    /** The printed closed form, or null (divergent, no value). */
    formula: formula.nullable(),
    written: z.enum(['principal', 'negated', 'pivots', 'fresnel', 'numeric', 'none']),
    /** Whether the printed form was confirmed against the continuous branch. */
    verified: z.boolean(),
    basis,
    value: complexValue.nullable(),
    scaled: scaledValue.optional(),
    pieces: z.array(z.object({ condition: formula, formula })).default([]),
  }),
  z.object({
    kind: z.literal('expect'),
    name: z.string(),
    expected: formula,
    holds: z.boolean(),
    /** exact: the difference simplified to 0 by algebra, confirmed by numbers. */
    exact: z.boolean(),
    basis,
    /** Largest relative difference seen (null when the expected value was not finite somewhere). */
    worst: z.number().nullable(),
    counterexample: z.object({ at: pointValues, lhs: complexValue, rhs: complexValue.nullable() }).optional(),
    /** Where it holds and where not, when that changes inside the domain (exact conditions). */
    regions: z.array(region).default([]),
    /** differs: the squares or exponentials differ exactly; sign: equal up to a sign read per cell;
     *  identical: the same rational function of the parameters and of exp/sinh/cosh/sin/cos values;
     *  continuous-sign: the same square and exponent, every radicand off the cut on the whole domain (several parameters), the sign read once per connected piece;
     *  exponential-form: the same after sinh, cosh and whole multiples of asinh are written as exponentials (cas/verdicts/expForm.ts);
     *  roots: the same once each square root is a symbol reduced by its square (no hyperbolic rewrite); sampled. */
    how: z.enum(['differs', 'sign', 'continuous-sign', 'identical', 'exponential-form', 'roots', 'sampled']).default('sampled'),
  }),
  z.object({
    kind: z.literal('numeric-check'),
    name: z.string(),
    at: pointValues.optional(),
    contour: z.enum(['real', 'rotated']),
    contourOf: z.string().optional(),
    contourLabels: z.array(z.string()).default([]),
    /** A further legal rotation made an oscillatory integrand absolutely convergent. */
    extraRotation: z.object({ angles: z.array(formula), vars: z.array(z.string()), checked: z.number() }).optional(),
    vars: z.number(),
    value: complexValue.nullable(),
    errorEstimate: z.number().nullable(),
    evaluations: z.number(),
    timeMs: z.number(),
    tolerance: z.number(),
    truncation: z.number(),
    timedOut: z.boolean(),
    /** Largest relative difference between the polarized numbers and the integrand at random points. */
    integrandCheck: z.number(),
    /** Why no quadrature ran, when none did. */
    refused: z.enum(['too-many-variables', 'no-contour']).optional(),
  }),
  z.object({
    kind: z.literal('numeric-agreement'),
    name: z.string(),
    closed: complexValue.nullable(),
    relativeDifference: z.number().nullable(),
    tolerance: z.number(),
    agrees: z.boolean(),
    /** The printed closed form evaluated as written (principal roots as printed) against the quadrature. */
    printed: z.object({ value: complexValue, relativeDifference: z.number(), agrees: z.boolean() }).optional(),
  }),
  z.object({
    kind: z.literal('rotation'),
    moves: z.array(z.object({ variable: z.string(), angle: formula, radians: z.number(), wick: z.boolean(), steepest: z.boolean() })),
  }),
  z.object({
    kind: z.literal('legality'),
    legal: z.boolean(),
    method: z.enum(['exact', 'grid']),
    /** Angles of the sweep checked (grid), 0 when decided exactly. */
    count: z.number(),
    basis,
    /** The first bad angle: for one variable the angle itself, else the fraction t of the sweep. */
    firstBad: z.object({ angle: formula.optional(), t: z.number().optional(), perVariable: z.record(z.string(), formula).default({}) }).optional(),
    vars: z.array(z.string()).default([]),
    direction: z.array(z.number()).optional(),
    at: pointValues.optional(),
    /** Where the rotation is allowed and where not, when that changes inside the domain (exact conditions). */
    regions: z.array(region).default([]),
    /** The angles that are allowed for a one-variable rotation, exactly. */
    range: formula.optional(),
    /** The integral diverges on the real contour: the rotated contour defines it (no sweep from the real line). */
    defines: z.boolean().default(false),
  }),
  z.object({ kind: z.literal('jacobian'), factor: formula, totalAngle: formula }),
  z.object({
    kind: z.literal('continuation'),
    name: z.string(),
    path: z.array(z.array(formula)),
    fixed: pointValues,
    /** Parameters given a value by the record (the simplest point of their domain). */
    chosen: z.array(z.string()).default([]),
    steps: z.number(), refined: z.number(),
    eigenRoute: z.boolean(), routesAgree: z.boolean(),
  }),
  z.object({
    kind: z.literal('continuation-event'),
    event: z.enum(['branch-point', 'cut-crossed', 'convergence-lost', 'convergence-regained']),
    at: pointValues,
    distance: z.number().optional(),
    side: z.enum(['left', 'right']).optional(),
    simple: z.boolean().optional(),
    closest: pointValues.optional(),
    fromAbove: z.boolean().optional(),
    rotation: z.object({ theta: z.number(), from: z.number(), to: z.number() }).nullable().optional(),
  }),
  z.object({
    kind: z.literal('sheet'),
    name: z.string(),
    at: pointValues,
    continued: complexValue, principal: complexValue,
    sheet: z.enum(['principal', 'minus-principal']),
    value: complexValue,
    closed: formula.nullable(),
    onCut: z.boolean(),
    eigenvalues: z.array(polarValue).default([]),
  }),
  z.object({
    kind: z.literal('comparison'),
    a: z.string(), b: z.string(),
    ratio: formula.nullable(),
    ratioValue: complexValue,
    constant: z.boolean(),
    basis,
    spread: z.number(),
    /** A proved constant ratio: shown with the values as symbols, after writing sinh, cosh and asinh as exponentials (cas/verdicts/expForm.ts), or with only square roots reduced by their squares. */
    how: z.enum(['values', 'exponential-form', 'roots']).optional(),
  }),
  z.object({
    kind: z.literal('comparison-verdict'),
    a: z.string(), b: z.string(),
    verdict: z.enum(['equal', 'phase', 'different']),
    phaseOverPiQuarter: z.number().nullable(),
    phase: z.number().optional(),
    example: z.object({ at: pointValues.optional(), ratio: complexValue }).optional(),
  }),
  z.object({
    kind: z.literal('derived'),
    name: z.string(),
    definition: formula,
    closed: formula.nullable(),
    compared: z.number(), agreeing: z.number(),
    usesResults: z.boolean(),
    value: complexValue.nullable(),
  }),
  z.object({
    /** moment NAME = P under Z: the Gaussian average of a polynomial by Wick (Isserlis) contractions. */
    kind: z.literal('moment'),
    name: z.string(),
    under: z.string(),
    polynomial: formula,
    /** The mean A^-1 J and the covariance A^-1 of the normalised Gaussian weight. */
    mean: z.array(formula),
    covariance: z.array(z.array(formula)),
    /** Pairings summed over the monomials after shifting by the mean ((2m-1)!! for degree 2m). */
    pairings: z.number(),
    result: formula,
    /** Where the average exists: the convergence verdict of the weight it is taken under. */
    convergence: z.enum(CONVERGENCE_VERDICTS),
    /** Under a Berezin integral: `covariance` holds the two-point function <theta_i theta_j>, found by direct expansion. */
    grassmann: z.boolean().optional(),
  }),
  z.object({
    /** derivative NAME = EXPR by p: exact by the chain rule, log Z differentiated through its pivots. */
    kind: z.literal('derivative'),
    name: z.string(),
    param: z.string(),
    of: formula,
    result: formula,
    /** Each result Z used enters through d log Z / dp, a rational function: listed here. */
    logDerivatives: z.array(z.object({ name: z.string(), formula })),
    checks: z.object({ count: z.number(), worst: z.number() }),
  }),
  z.object({
    /**
     * The regularisation chosen for a product over infinitely many modes: zeta (prod lambda_n =
     * exp(-zeta'(0)), zeta(s) = sum lambda_n^-s continued to s = 0), with the branch of
     * lambda^-s and the value zeta(0) (the power a constant factor of lambda_n enters with).
     */
    kind: z.literal('regularisation'),
    name: z.string(),
    method: z.literal('zeta'),
    /** The modes: n >= 0, n >= 1, or all integers. */
    from: z.union([z.literal(0), z.literal(1), z.literal('all')]),
    index: z.string(),
    factor: formula,
    zetaAtZero: formula,
    /** The arguments taken for lambda^-s: principal (leading coefficient and roots as they come), or, over all integers, the upper or lower half plane where Im u is positive or negative. */
    branch: z.enum(['principal', 'upper', 'lower']),
    /** How the sign of Im u was decided (all integers only): exactly, or at sample points. */
    decided: z.enum(['exact', 'sampled']).optional(),
  }),
  z.object({
    /** product NAME = P over modes: the factorisation into linear factors and the closed form. */
    kind: z.literal('mode-product'),
    name: z.string(),
    /** The mode index as written (n when absent: records made before it was stored). */
    index: z.string().optional(),
    leading: formula,
    /** The exact roots shifted: P(n) = leading * prod (n + b_j). */
    shifts: z.array(formula),
    result: formula,
    value: complexValue.nullable(),
    /** Why the product of the linear factors' regularised products equals the regularised product of P (no multiplicative anomaly). */
    anomaly: z.enum(['linear', 'split-polynomial', 'all-integers', 'all-integers-quadratic', 'factored-polynomial', 'all-integers-even']),
    /** A formula used by name: lerch (prod (n + b) = sqrt(2*pi)/Gamma(b)), reflection (Gamma(1+x)*Gamma(1-x) = pi*x/sin(pi*x)), periodic (all integers). */
    formulas: z.array(z.enum(['lerch', 'reflection', 'all-integers'])),
    /** Degree >= 3: P = leading * prod factor^power exactly, each factor monic of degree 1 or 2 in n (found numerically, confirmed by exact division); repeated: a square-free decomposition found a power. */
    factorisation: z.object({ factors: z.array(z.object({ factor: formula, power: z.number().int().positive() })), repeated: z.boolean() }).optional(),
  }),
  z.object({
    /**
     * sum NAME = exp(-pi*a*n^2 + 2*pi*i*b*n + g) over all n, resummed by Poisson:
     * sum_n exp(-pi*a*n^2 + 2*pi*i*b*n) = a^(-1/2) * sum_m exp(-pi*(m - b)^2/a) for Re a > 0, with
     * the principal a^(-1/2) (the branch continuous from a > 0; Re a > 0 keeps a off the cut).
     */
    kind: z.literal('poisson-resummation'),
    name: z.string(),
    index: z.string(),
    term: formula,
    a: formula,
    b: formula,
    /** The n-free part g of the exponent (a factor exp(g)), or null. */
    constant: formula.nullable(),
    /** Re a > 0 on the declared domain: proved exactly, or at sample points (with the box). */
    realPart: basis,
    value: complexValue.nullable(),
  }),
  z.object({
    /**
     * The small-a form of a Gaussian sum: sum = exp(g) * a^(-1/2) * (exp(-pi*(m0 - b)^2/a) + R),
     * m0 the integer nearest c = Re b - Im b*Im(1/a)/Re(1/a), with the stated bound on |R|.
     */
    kind: z.literal('small-parameter-form'),
    name: z.string(),
    leading: formula,
    /** m0 when it is decided (b = 0, or numbers); null: the nearest integer to c at each point. */
    nearest: z.number().nullable(),
    /** The bound on |R| as a formula in s = Re(1/a) (and Im b, |1/a| when b is not real), and its number where params are numbers. */
    bound: formula,
    boundValue: z.number().nullable(),
  }),
  z.object({
    /**
     * A modular transformation used by the exact expansion: eta(tau) = (-i*tau)^(-1/2) * eta(-1/tau)
     * or a Gaussian sum's Poisson dual, with the leading factor kept and the rest an exponentially
     * small remainder, bounded beyond all orders of the expansion parameter.
     */
    kind: z.literal('modular'),
    of: z.enum(['eta', 'sum']),
    /** The sum's name, or the eta call as written. */
    label: z.string(),
    argument: formula,
    dual: formula,
    leading: formula,
    /** |remainder| <= bound (relative), the rate exp(-c/u) read off the dual argument. */
    bound: formula,
  }),
  z.object({
    /** verify on a functional determinant: y'' = V y solved by Runge-Kutta, against the closed form. */
    kind: z.literal('ode-check'),
    name: z.string(),
    at: pointValues,
    conditions: z.enum(['dirichlet', 'periodic', 'antiperiodic']),
    value: complexValue,
    closed: complexValue,
    /** Runge-Kutta steps of the accepted solve, and its relative difference from the solve with half as many. */
    steps: z.number(),
    stepDifference: z.number(),
    relativeDifference: z.number(),
    tolerance: z.number(),
    agrees: z.boolean(),
  }),
  z.object({
    /**
     * verify of a Gaussian sum, or of a derived quantity built from sums and eta: the definitions
     * summed and multiplied term by term (no Poisson resummation, no modular transformation) until
     * the terms stop changing the result, against the closed-form value.
     */
    kind: z.literal('series-check'),
    name: z.string(),
    at: pointValues,
    value: complexValue,
    closed: complexValue,
    /** Terms (sum) or factors (eta products) used, and the size of the last one. */
    terms: z.number(),
    lastTerm: z.number(),
    relativeDifference: z.number(),
    tolerance: z.number(),
    agrees: z.boolean(),
  }),
  z.object({
    /**
     * sliced NAME = V on interval L | on circle beta ... with N slices: the time-sliced
     * determinant. eps = L/N; interval (Dirichlet): the (N-1)x(N-1) tridiagonal matrix with
     * 2 + eps^2 V on the diagonal and -1 beside it, by its recursion, as the ratio to V = 0;
     * circle: the N x N circulant (corners -1 periodic, +1 antiperiodic), by its eigenvalues.
     */
    kind: z.literal('time-slicing'),
    name: z.string(),
    potential: formula,
    shape: z.enum(['interval', 'circle']),
    conditions: z.enum(['dirichlet', 'periodic', 'antiperiodic']),
    length: formula,
    slices: formula,
    /** exact: V constant, closed form in N; matrix: V depends on t, N a number, the determinant by elimination. */
    method: z.enum(['exact', 'matrix']),
    /** The chosen theta with cosh(theta) = 1 + eps^2 V/2 (exact method). */
    theta: formula.nullable(),
    /** real: V >= 0 on the whole domain, theta real >= 0; any: V may be negative or complex, and the result (a polynomial in cosh(theta)) does not depend on the root taken. */
    thetaBranch: z.enum(['real', 'any']).nullable(),
    result: formula.nullable(),
    value: complexValue.nullable(),
    /** Periodic at V = 0: the constant zero mode removed, det' = N^2 (prod over k = 1..N-1 of 4*sin(pi*k/N)^2). */
    zeroMode: z.boolean(),
    /** The closed form against the determinant of the explicit matrix by LU elimination: slice counts, points, worst relative difference. */
    checks: z.object({ slices: z.array(z.number()), points: z.number(), worst: z.number() }).nullable(),
  }),
  z.object({
    /** determinant NAME = V on interval L / on circle beta: det(-d^2/dt^2 + V). */
    kind: z.literal('functional-determinant'),
    name: z.string(),
    potential: formula,
    shape: z.enum(['interval', 'circle']),
    conditions: z.enum(['dirichlet', 'periodic', 'antiperiodic']),
    length: formula,
    /** exact: V constant, closed form; ode: V(t) by the initial-value problem, numerically. */
    method: z.enum(['exact', 'ode']),
    result: formula.nullable(),
    value: complexValue.nullable(),
    /** The periodic zero mode at V = 0 (the constant), removed: det' = the reduced formula. */
    zeroMode: z.object({ reduced: formula }).nullable(),
    /** The ODE solve: RK4 steps of the finer grid and the relative difference from the coarser one. */
    ode: z.object({ steps: z.number(), difference: z.number() }).nullable(),
  }),
  z.object({
    /** Complex and Grassmann integration variables: the measure convention the result depends on. */
    kind: z.literal('variables'),
    complex: z.array(z.object({ name: z.string(), re: z.string(), im: z.string() })),
    grassmann: z.array(z.string()),
  }),
  z.object({
    /** The Berezin integral of exp(-1/2 theta^T A theta): Pf(A) with the measure in the order written. */
    kind: z.literal('berezin'),
    vars: z.array(z.string()),
    A: z.array(z.array(formula)),
    pfaffian: formula,
    /** A constant factor exp(c) from the exponent's theta-free part, when there is one. */
    constant: formula.nullable(),
  }),
  z.object({
    kind: z.literal('limit'),
    name: z.string(),
    param: z.string(),
    to: formula,
    /** value: a finite limit; asymptotic: leading behaviour ~; divergent; oscillating; unknown. */
    outcome: z.enum(['value', 'asymptotic', 'divergent', 'oscillating', 'unknown']),
    formula: formula.nullable(),
    value: complexValue.nullable(),
    /** How it was found, in a word the renderer turns into a clause. */
    method: z.enum(['substitution', 'algebra-limit', 'recognised', 'read-off', 'logarithmic', 'expansion', 'none']),
    basis,
    checks: z.object({ count: z.number(), worst: z.number(), at: z.number().optional() }).optional(),
    power: z.number().optional(),
    correction: z.object({ formula: formula.nullable(), power: z.number() }).optional(),
    constantTerm: complexValue.optional(),
    at: pointValues.optional(),
    /** For a limit 0 found by expansion: the leading term it is approached like. */
    rate: formula.optional(),
    /** For an unknown limit: why the exact expansion could not decide it. */
    reason: z.string().optional(),
    /** An exponentially small remainder beyond all orders (from modular transformations): its O-term and, when every constant is known, a bound valid once each of its terms is below 1/2. */
    remainder: z.object({ order: formula, bound: formula.nullable() }).optional(),
  }),
]);
export type Step = z.infer<typeof step>;
export type StepKind = Step['kind'];
export type StepOf<K extends StepKind> = Extract<Step, { kind: K }>;
export const STEP_KINDS = step.options.map((o) => o.shape.kind.value) as StepKind[];

export const statementError = z.object({ message: z.string(), line: z.number(), column: z.number() });
export type StatementError = z.infer<typeof statementError>;

export const CONVERGENCE = ['absolute', 'oscillatory', 'divergent', 'piecewise', 'unknown'] as const;
export type Convergence = (typeof CONVERGENCE)[number];
export const PROOF = ['proved', 'sampled'] as const;
export type Proof = (typeof PROOF)[number];

export const resultRecord = z.object({
  text: z.string(),
  latex: z.string(),
  /** Present when the result has no free parameters and fits in double precision. */
  value: complexValue.nullable(),
  /** Present instead of value when the value is outside double range. */
  scaled: scaledValue.optional(),
});
export type ResultRecord = z.infer<typeof resultRecord>;

/** The branch verdict of a Gaussian result; its reasons are the statement's `branch` step. */
export const branchRecord = z.object({
  principalSqrtDetCorrect: z.boolean(),
  principal: z.enum(['right', 'wrong', 'piecewise', 'unknown']),
});
export type BranchRecord = z.infer<typeof branchRecord>;

export const statementReport = z.object({
  line: z.number(),
  /** The statement as written (its line without the comment), so exports never re-read the source. */
  source: z.string().default(''),
  kind: z.enum(STATEMENT_KINDS),
  name: z.string().nullable(),
  status: z.enum(['ok', 'failed', 'error']),
  convergence: z.enum(CONVERGENCE).nullable(),
  proof: z.enum(PROOF).nullable(),
  result: resultRecord.nullable(),
  branch: branchRecord.nullable(),
  steps: z.array(step),
  error: statementError.nullable(),
  /** Complex-plane diagram data (contours, sectors, cuts, paths, tracks, eigenvalues). */
  diagram: diagramData.optional(),
  /** rotate: whether the rotation is allowed over the whole swept family (result is null when false). */
  legal: z.boolean().optional(),
  /** continue: the sheet of the end value relative to the principal 1/sqrt(det A). */
  sheet: z.enum(['principal', 'minus-principal']).optional(),
  /** compare: equal, equal up to a constant phase, or different. */
  verdict: z.enum(['equal', 'phase', 'different']).optional(),
  /** compare: m when the ratio is exp(i m pi/4), else null. */
  phaseOverPiQuarter: z.number().int().nullable().optional(),
  /** verify: whether the quadrature agrees with the closed form within the tolerance. */
  agrees: z.boolean().optional(),
});
export type StatementReport = z.infer<typeof statementReport>;

/** Names a worksheet declares, read by the parser: what the editor offers in completions and hovers. */
export const worksheetSymbols = z.object({
  params: z.array(z.object({ name: z.string(), domain: z.enum(DOMAINS), line: z.number() })),
  variables: z.array(z.string()),
  results: z.array(z.object({ name: z.string(), line: z.number() })),
});
export type WorksheetSymbols = z.infer<typeof worksheetSymbols>;

export const worksheetReport = z.object({
  file: z.string().nullable(),
  ok: z.boolean(),
  /** The version of the computation core that made this report; a stored report of another version is recomputed. */
  engine: z.string().default(''),
  symbols: worksheetSymbols.default({ params: [], variables: [], results: [] }),
  statements: z.array(statementReport),
});

/** A streamed evaluation's progress: statement `index` (0-based, of `total`) on `line` has started. */
export const evaluationProgress = z.object({ index: z.number(), line: z.number(), total: z.number() });
export type EvaluationProgress = z.infer<typeof evaluationProgress>;
export type WorksheetReport = z.infer<typeof worksheetReport>;

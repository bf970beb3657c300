/**
 * The evaluation record of a worksheet: what the computation core returns, what
 * the server sends to the client, what the command line tool prints with --json.
 * shared/ imports nothing from src/, server/ or cas/.
 */
import { z } from 'zod';
import { diagramData } from './diagram.js';
import { DOMAINS } from './language.js';

export const STATEMENT_KINDS = [
  'param', 'integral', 'expect', 'note', 'rotate', 'continue', 'compare', 'verify', 'let', 'limit', 'invalid',
] as const;
export type StatementKind = (typeof STATEMENT_KINDS)[number];

export { DOMAINS, type Domain } from './language.js';

export const complexValue = z.object({ re: z.number(), im: z.number() });
export type ComplexValue = z.infer<typeof complexValue>;

/** An eigenvalue (or pivot) with its argument in radians, in (-pi, pi]. */
export const polarValue = z.object({ re: z.number(), im: z.number(), arg: z.number() });
export type PolarValue = z.infer<typeof polarValue>;

export const STEP_KINDS = [
  'integrand', 'quadratic-form', 'convergence', 'branch', 'fresnel-phase', 'result',
  'expect', 'param', 'note', 'numeric-check', 'simplification',
  'rotation', 'legality', 'jacobian', 'continuation', 'continuation-event', 'sheet', 'comparison', 'derived', 'limit',
] as const;
export type StepKind = (typeof STEP_KINDS)[number];

/** One numbered step of the record: a sentence, a formula, and the numbers that decided it. */
export const step = z.object({
  kind: z.enum(STEP_KINDS),
  text: z.string(),
  latex: z.string(),
  /** Eigenvalues of A (at the parameter point named in `at`, if any). */
  eigenvalues: z.array(polarValue).optional(),
  /** Pivots d_k of A = L D L^T without pivoting. */
  pivots: z.array(polarValue).optional(),
  /** Sum of the eigenvalue arguments: the principal root of det A is right iff it lies in (-pi, pi]. */
  argumentSum: z.number().optional(),
  /** Eigenvalues of the real symmetric Re A (convergence) or of B (Fresnel signature). */
  realEigenvalues: z.array(z.number()).optional(),
  signature: z.object({ positive: z.number(), negative: z.number() }).optional(),
  /** A real direction x along which |integrand| grows (divergent integrals). */
  direction: z.array(z.number()).optional(),
  /** How many parameter points a sampled verdict rests on, and how many agreed. */
  samples: z.object({ count: z.number(), agreeing: z.number() }).optional(),
  /** Parameter values of a decisive sample point. */
  at: z.record(z.string(), complexValue).optional(),
  /** Largest relative deviation seen in a numeric comparison. */
  relativeError: z.number().optional(),
  /** Rotation angles (radians) per rotated variable, and how the swept family was checked. */
  angles: z.object({
    method: z.enum(['exact', 'grid']),
    /** How many angles of the sweep were checked (grid), or 0 when decided exactly. */
    count: z.number(),
    values: z.record(z.string(), z.number()),
    /** First angle (fraction t of the sweep times each angle) where the integrand grows; absent when legal. */
    firstBad: z.number().nullable().optional(),
  }).optional(),
  /** A numeric quadrature: value, error estimate, integrand evaluations, time. */
  quadrature: z.object({
    value: complexValue,
    errorEstimate: z.number(),
    evaluations: z.number(),
    timeMs: z.number(),
    tolerance: z.number(),
    timedOut: z.boolean(),
  }).optional(),
  /** A continuation event: what kind, and where on the path (parameter values). */
  event: z.object({
    kind: z.string(),
    at: z.record(z.string(), complexValue),
    /** Distance from the path to a branch point, when one was located. */
    distance: z.number().optional(),
  }).optional(),
  /** The ratio of a comparison at the sampled points is exp(i m pi/4) with this m. */
  phaseOverPiQuarter: z.number().nullable().optional(),
});
export type Step = z.infer<typeof step>;

export const statementError = z.object({ message: z.string(), line: z.number(), column: z.number() });
export type StatementError = z.infer<typeof statementError>;

export const CONVERGENCE = ['absolute', 'oscillatory', 'divergent', 'unknown'] as const;
export type Convergence = (typeof CONVERGENCE)[number];
export const PROOF = ['proved', 'sampled'] as const;
export type Proof = (typeof PROOF)[number];

export const resultRecord = z.object({
  text: z.string(),
  latex: z.string(),
  /** Present when the result has no free parameters. */
  value: complexValue.nullable(),
});
export type ResultRecord = z.infer<typeof resultRecord>;

export const branchRecord = z.object({ principalSqrtDetCorrect: z.boolean(), reason: z.string() });
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

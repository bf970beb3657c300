/** What earlier statements leave for later ones: declared parameters and named results. */
import type { Convergence, Domain, StatementReport } from '../../shared/evaluation.js';
import type { Expr } from '../lang/ast.js';
import type { Point } from '../domains/sample.js';
import type { C } from '../numeric/cmatrix.js';
import type { QuadraticForm } from '../gaussian/form.js';
import type { RatFunc } from '../exact/ratfunc.js';

/** What a Gaussian result keeps for rotate, continue and verify: the integrand as written and its quadratic form. */
export interface GaussianInfo {
  integrand: Expr;
  vars: string[];
  form: QuadraticForm;
  prefactor: Expr;
  convergence: Convergence;
  /** Set on a rotated result: the result it came from and the angle of each of its variables (0 when not rotated). */
  contour: { of: string; angles: number[]; labels: string[] } | null;
}

/** integer: declared `positive integer` (a count such as a number of slices); every verdict on positive reals holds for it too. */
/** sum_n exp(-pi*a*n^2 + 2*pi*i*b*n + g) with a, b, g rational in the parameters (and pi). */
export interface LatticeInfo { a: RatFunc; b: RatFunc; g: RatFunc }

export interface ParamInfo { domain: Domain; line: number; integer?: boolean }

export interface ResultInfo {
  line: number;
  /** Why the result has no value, when it has none. */
  unavailable: string | null;
  /** The written closed form, or null (divergent, or errored). */
  expr: Expr | null;
  params: string[];
  /** The value on the continuous branch at a parameter point; null where it diverges. */
  valueAt: ((p: Point) => C | null) | null;
  gaussian?: GaussianInfo;
  /** A derived quantity's definition as written (let), for routes that read its shape. */
  definition?: Expr;
  /**
   * let: the definition with the results' own exact forms substituted, before the general
   * algebra package simplifies it (the displayed form is checked only at sample points).
   * Proofs (expect, compare) read this, so a proof never rests on a sampled rewrite.
   */
  exactForm?: Expr;
  /** A Berezin integral's Grassmann variables (in the order written) and its antisymmetric A: moments under it. */
  berezin?: { vars: string[]; A: RatFunc[][] };
  /** A Gaussian sum over the integers (sum statement): the term exp(-pi*a*n^2 + 2*pi*i*b*n + g), exactly; the expansion engine and verify read it. */
  lattice?: LatticeInfo;
  /** A functional determinant: its operator and conditions, for verify's independent ODE solve. */
  determinant?: { potential: Expr; length: Expr; conditions: 'dirichlet' | 'periodic' | 'antiperiodic'; zeroMode: boolean; byOde: boolean };
}

/** A result that has a value function: what resultNamed hands to the statements that use one. */
export type AvailableResult = ResultInfo & { unavailable: null; valueAt: NonNullable<ResultInfo['valueAt']> };

export interface Context {
  params: Map<string, ParamInfo>;
  results: Map<string, ResultInfo>;
}

export function newContext(): Context { return { params: new Map(), results: new Map() }; }

export function blankReport(line: number, kind: StatementReport['kind'], name: string | null): StatementReport {
  return { line, source: '', kind, name, status: 'ok', convergence: null, proof: null, result: null, branch: null, steps: [], error: null };
}

/** A located failure of one statement; the worksheet goes on with the next. */
export class StatementFailure extends Error {
  constructor(message: string, readonly line: number, readonly column: number) { super(message); }
}

export function domainsOf(ctx: Context, names: readonly string[]): Map<string, Domain> {
  const out = new Map<string, Domain>();
  for (const n of names) { const p = ctx.params.get(n); if (p) out.set(n, p.domain); }
  return out;
}

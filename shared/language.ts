/**
 * Facts of the worksheet language, in one place: its statement keywords, the words
 * inside statements, domains, functions, constants and the size limits of what it
 * computes. The parser in cas/lang reads its word lists from here; the server's
 * limits and the editor's completion, hover and highlighting do too, so no second
 * copy of the language exists. shared/ imports nothing from src/, server/ or cas/.
 *
 * Example: FUNCTION_NAMES.includes('sqrt') is true; STATEMENTS.param.example is
 * 'param k : positive'.
 */

/** Statement keywords with their form, a worked example and a sentence of help. */
export const STATEMENTS = {
  param: { form: 'param NAME, ... : DOMAIN | positive integer', example: 'param k : positive', help: 'Declare parameters and their domain; `positive integer` declares a count, such as a number of slices.' },
  integral: { form: 'integral NAME = EXPR d(VARS) [d(VARS : complex) d(VARS : grassmann)]', example: 'integral Z = exp(-k*x^2/2) d(x)', help: 'A Gaussian integral over real variables, complex variables (d^2z = dx dy) or Grassmann variables (Berezin, integrated in the order written).' },
  expect: { form: 'expect NAME = EXPR', example: 'expect Z = sqrt(2*pi/k)', help: 'State the expected value; a mismatch fails the worksheet.' },
  let: { form: 'let NAME = EXPR', example: 'let F = -log(Z)', help: 'Name a quantity derived from results and parameters.' },
  rotate: { form: 'rotate NAME : VAR -> FACTOR*VAR, ... as NEW', example: 'rotate Z : x -> exp(-i*pi/4)*x as ZR', help: 'Turn the contour of a variable; the rotation is checked.' },
  continue: { form: 'continue NAME : PARAM along P0 -> P1 -> ... [at NAME = VALUE, ...]', example: 'continue Z : lam along 0 -> 2*i', help: 'Follow a result along a path in a parameter, recording branch points and cuts.' },
  compare: { form: 'compare NAME with NAME', example: 'compare ZL with Z', help: 'The ratio of two results, its phase and a verdict.' },
  verify: { form: 'verify NAME [at NAME = VALUE, ...] [with tolerance T]', example: 'verify Z at k = 2', help: 'Check a result by code that shares nothing with its closed form: an integral by quadrature along its contour, a sum or eta by partial sums and products, a functional determinant by solving y\'\' = V y.' },
  limit: { form: 'limit NAME : PARAM -> VALUE | inf | -inf', example: 'limit Z : k -> inf', help: 'The limit or leading behaviour of a result.' },
  moment: { form: 'moment NAME = POLYNOMIAL under RESULT', example: 'moment X2 = x^2 under Z', help: 'The Gaussian average of a polynomial in the variables of an integral, by Wick contractions.' },
  derivative: { form: 'derivative NAME = EXPR by PARAM', example: 'derivative E = -log(Z) by beta', help: 'The exact derivative of a quantity built from results and parameters.' },
  product: { form: 'product NAME = POLYNOMIAL over n >= 1 | n >= 0 | all n', example: 'product P = n^2 + a^2 over n >= 1', help: 'A product over infinitely many modes, regularised by its zeta function, in closed form.' },
  determinant: { form: 'determinant NAME = V on interval L | on circle BETA periodic | antiperiodic', example: 'determinant D = w^2 on interval L', help: 'The determinant of -d^2/dt^2 + V(t) (V in the variable t): on an interval with Dirichlet ends as the ratio to V = 0, on a circle zeta-regularised.' },
  sliced: { form: 'sliced NAME = V on interval L | on circle BETA periodic | antiperiodic with N slices', example: 'sliced S = w^2 on interval L with N slices', help: 'The time-sliced determinant of -d^2/dt^2 + V with N slices (N a number or a positive integer parameter): on an interval as the ratio to V = 0, on a circle the circulant\'s determinant; its N -> inf limit is the functional determinant.' },
  sum: { form: 'sum NAME = exp(QUADRATIC in n) over all n', example: 'sum Z = exp(-pi*a*n^2 + 2*pi*i*b*n) over all n', help: 'A Gaussian sum over the integers (a theta function), resummed by Poisson: the value, the branch of a^(-1/2), and the small-a form with a bound on its remainder.' },
  note: { form: 'note "TEXT"', example: 'note "Euclidean version first."', help: 'Free text kept with the record.' },
} as const;
export type StatementKeyword = keyof typeof STATEMENTS;
export const STATEMENT_KEYWORDS = Object.keys(STATEMENTS) as StatementKeyword[];

/** Words that appear inside statements (after the keyword). */
export const CLAUSE_WORDS = ['along', 'as', 'at', 'with', 'tolerance', 'steepest', 'inf', 'under', 'by', 'grassmann', 'over', 'all', 'on', 'interval', 'circle', 'periodic', 'antiperiodic', 'slices', 'integer'] as const;

export const DOMAINS = ['positive', 'negative', 'real', 'complex', 'nonzero'] as const;
export type Domain = (typeof DOMAINS)[number];
export const DOMAIN_HELP: Record<Domain, string> = {
  positive: 'a positive real number',
  negative: 'a negative real number',
  real: 'a real number',
  complex: 'a complex number',
  nonzero: 'a nonzero real number',
};
/** The one domain of two words: a count (a number of slices), integer as well as positive. */
export const COUNT_DOMAIN = { label: 'positive integer', help: 'a positive integer, a count such as a number of slices' } as const;

/** Functions of one argument, principal branches throughout. */
export const FUNCTIONS = {
  exp: 'exponential function; Euler\'s number is exp(1)',
  sqrt: 'principal square root (cut along the negative real axis)',
  log: 'principal logarithm (cut along the negative real axis)',
  sin: 'sine',
  cos: 'cosine',
  sinh: 'hyperbolic sine',
  cosh: 'hyperbolic cosine',
  asinh: 'inverse hyperbolic sine (principal: cuts along the imaginary axis beyond +-i)',
  Gamma: 'Euler\'s Gamma function (principal: analytic except at 0, -1, -2, ...)',
  eta: 'the Dedekind eta function q^(1/24)*prod (1 - q^n), q = exp(2*pi*i*tau), for Im tau > 0 (for q = exp(-beta) write eta(i*beta/(2*pi)))',
  conj: 'complex conjugate; conj(z) of a complex integration variable z is its own variable',
} as const;
export type FunctionName = keyof typeof FUNCTIONS;
export const FUNCTION_NAMES = Object.keys(FUNCTIONS) as FunctionName[];

/** Constants. Euler's number has no name of its own (write exp(1)), so e is free for a charge. */
export const CONSTANTS = {
  i: 'the imaginary unit',
  pi: 'the circle constant',
} as const;
export const CONSTANT_NAMES = Object.keys(CONSTANTS) as (keyof typeof CONSTANTS)[];

/** Names a worksheet cannot give to a parameter, variable or result. */
export const RESERVED_NAMES: readonly string[] = [
  ...CONSTANT_NAMES, ...FUNCTION_NAMES, ...STATEMENT_KEYWORDS, ...DOMAINS, ...CLAUSE_WORDS,
];

/** Size limits of the language, the same for the server's checks and the computation core. */
export const LANGUAGE_LIMITS = {
  statementsPerWorksheet: 400,
  /** Characters of one statement (comments and note texts aside). */
  statementLength: 20_000,
  /** Nesting of parentheses in one statement. */
  expressionDepth: 64,
  /** Integration variables of one integral whose coefficients hold params. */
  symbolicVariables: 8,
  /** Integration variables of one integral with numbers only. */
  numericVariables: 400,
} as const;

import { STATEMENT_KEYWORDS, STATEMENTS, type StatementKeyword } from '@shared/language';

/**
 * The lines each statement's example needs before it (the names it uses). The example line
 * itself is STATEMENTS[keyword].example from shared/language.ts, never copied here.
 */
const PRELUDE: Record<StatementKeyword, string[]> = {
  param: [],
  integral: ['param k : positive'],
  expect: ['param k : positive', 'integral Z = exp(-k*x^2/2) d(x)'],
  let: ['param k : positive', 'integral Z = exp(-k*x^2/2) d(x)'],
  rotate: ['param k : positive', 'integral Z = exp(-i*k*x^2/2) d(x)'],
  continue: ['param lam : real', 'integral Z = exp(-(1 + lam)*x^2/2) d(x)'],
  compare: ['param k : positive', 'integral Z = exp(-k*x^2/2) d(x)', 'integral ZL = exp(-k*y^2/2) d(y)'],
  verify: ['param k : positive', 'integral Z = exp(-k*x^2/2) d(x)'],
  limit: ['param k : positive', 'integral Z = exp(-k*x^2/2) d(x)'],
  moment: ['param k : positive', 'integral Z = exp(-k*x^2/2) d(x)'],
  derivative: ['param beta : positive', 'integral Z = exp(-beta*x^2/2) d(x)'],
  product: ['param a : positive'],
  determinant: ['param w, L : positive'],
  sliced: ['param w, L : positive', 'param N : positive integer'],
  sum: ['param a : positive', 'param b : real'],
  note: [],
};

export interface WorkedExample {
  keyword: StatementKeyword;
  form: string;
  help: string;
  example: string;
  /** The whole worksheet that is evaluated: the prelude, then the example on the last line. */
  source: string;
  /** The example's line in that worksheet. */
  line: number;
}

/** One worked example per statement keyword, in the language's own order. */
export const WORKED_EXAMPLES: WorkedExample[] = STATEMENT_KEYWORDS.map((keyword) => {
  const { form, help, example } = STATEMENTS[keyword];
  const lines = [...PRELUDE[keyword], example];
  return { keyword, form, help, example, source: `${lines.join('\n')}\n`, line: lines.length };
});

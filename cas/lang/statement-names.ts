/**
 * The names each statement defines and the names it uses, read from its syntax tree.
 * Review fingerprints (a review goes stale when anything its statement uses changes),
 * the server's size checks and the editor's list of declared names all come from here,
 * so no other part of the product reads worksheet text.
 *
 * Example: for `param a, b : positive` defined is ['a', 'b']; for
 * `integral Z = exp(-a*x^2) d(x)` defined is ['Z'], used is ['a'], variables ['x'].
 */
import type { Expr, Statement } from './ast.js';
import { freeNames } from '../expr/names.js';

export interface StatementNames {
  /** Parameters and results the statement introduces. */
  defined: string[];
  /** Parameters and results it refers to (integration variables excluded), in order of first use. */
  used: string[];
  /** Integration variables of an integral. */
  variables: string[];
}

function namesIn(exprs: readonly Expr[], skip: ReadonlySet<string> = new Set()): string[] {
  const out = new Set<string>();
  for (const e of exprs) for (const n of freeNames(e).keys()) if (!skip.has(n)) out.add(n);
  return [...out];
}

const uniq = (xs: string[]) => [...new Set(xs)];

export function statementNames(s: Statement): StatementNames {
  switch (s.kind) {
    case 'param':
      return { defined: s.names.map((n) => n.name), used: [], variables: [] };
    case 'integral': {
      const vars = s.vars.map((v) => v.name);
      return { defined: [s.name.name], used: namesIn([s.integrand], new Set(vars)), variables: vars };
    }
    case 'expect':
      return { defined: [], used: uniq([s.name.name, ...namesIn([s.expr])]), variables: [] };
    case 'let':
      return { defined: [s.name.name], used: namesIn([s.expr]), variables: [] };
    case 'rotate': {
      const moved = new Set(s.moves.map((m) => m.variable.name));
      const factors = s.moves.flatMap((m) => (m.to === 'steepest' ? [] : [m.to]));
      return { defined: [s.as.name], used: uniq([s.target.name, ...namesIn(factors, moved)]), variables: [] };
    }
    case 'continue':
      return {
        defined: [],
        used: uniq([s.target.name, ...s.params.map((p) => p.name), ...s.at.map((b) => b.name.name), ...namesIn([...s.points.flat(), ...s.at.map((b) => b.value)])]),
        variables: [],
      };
    case 'compare':
      return { defined: [], used: uniq([s.target.name, s.other.name]), variables: [] };
    case 'verify':
      return {
        defined: [],
        used: uniq([s.target.name, ...s.at.map((b) => b.name.name), ...namesIn([...s.at.map((b) => b.value), ...(s.tolerance ? [s.tolerance] : [])])]),
        variables: [],
      };
    case 'limit':
      return { defined: [], used: uniq([s.target.name, s.param.name, ...(s.to === 'inf' || s.to === '-inf' ? [] : namesIn([s.to]))]), variables: [] };
    case 'note':
      return { defined: [], used: [], variables: [] };
    case 'moment':
      // the polynomial's names are the target's integration variables (checked at evaluation)
      return { defined: [s.name.name], used: [s.target.name], variables: [] };
    case 'derivative':
      return { defined: [s.name.name], used: uniq([s.param.name, ...namesIn([s.expr])]), variables: [] };
    case 'product':
      return { defined: [s.name.name], used: namesIn([s.factor], new Set([s.index.name])), variables: [s.index.name] };
    case 'determinant':
      // t is the potential's variable
      return { defined: [s.name.name], used: namesIn([s.potential, s.length], new Set(['t'])), variables: ['t'] };
    case 'sum':
      return { defined: [s.name.name], used: namesIn([s.term], new Set([s.index.name])), variables: [s.index.name] };
    case 'sliced':
      // t is the potential's variable, as in determinant
      return { defined: [s.name.name], used: namesIn([s.potential, s.length, s.slices], new Set(['t'])), variables: ['t'] };
  }
}

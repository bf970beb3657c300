/**
 * An expression rebuilt from its leaves up, for the passes that replace some of its parts
 * by symbols or other forms (function values as symbols in atoms.ts, exponential forms in
 * verdicts/expForm.ts, square roots reduced in rootsReduced.ts). Numbers, constants and
 * names stay; a negation and a binary operation are rebuilt from their rebuilt parts,
 * unless `bin` answers for the operation (it is given the rebuilt operands, and answers
 * undefined to leave it as usual); every call is answered by `call`, which is given the
 * walk itself for its arguments. A null from any part makes the whole null: out of reach.
 *
 * Example: rebuild(e, { call: (x) => x }) is a copy of e with its calls as they were.
 */
import type { Expr } from '../lang/ast.js';

export type BinExpr = Extract<Expr, { t: 'bin' }>;
export type CallExpr = Extract<Expr, { t: 'call' }>;

export interface RebuildHooks {
  bin?: (x: BinExpr, a: Expr, b: Expr) => Expr | null | undefined;
  call: (x: CallExpr, walk: (e: Expr) => Expr | null) => Expr | null;
}

export function rebuild(e: Expr, hooks: RebuildHooks): Expr | null {
  const walk = (x: Expr): Expr | null => {
    switch (x.t) {
      case 'num': case 'const': case 'name':
        return x;
      case 'neg': {
        const a = walk(x.a);
        return a && { t: 'neg', a };
      }
      case 'bin': {
        const a = walk(x.a);
        const b = a && walk(x.b);
        if (!a || !b) return null;
        const answered = hooks.bin?.(x, a, b);
        return answered !== undefined ? answered : { t: 'bin', op: x.op, a, b };
      }
      case 'call':
        return hooks.call(x, walk);
    }
  };
  return walk(e);
}

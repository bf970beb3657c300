/**
 * Function values as symbols. An expression made of numbers, parameters, pi, + - * / and
 * integer powers of function values f(r) becomes a rational function once each distinct
 * value is replaced by a symbol of its own (its argument compared exactly, itself with
 * the values inside it replaced). The identity proof (verdicts/identity.ts) admits only
 * single-valued entire functions; the display form `cancelled` below admits any value,
 * because cancelling common factors of a rational function is valid whatever the symbols
 * stand for (on the set where both forms are defined).
 *
 * Example: cancelled(2*pi*(L/pi)*sinh(L*w)/(L*w)) is 2*sinh(L*w)/w.
 */
import type { Expr } from '../lang/ast.js';
import { fromExpr, rfToString } from '../exact/ratfunc.js';
import { ratExpr } from './fromExact.js';
import { substitute } from './names.js';
import { formulaOf } from './print.js';
import { rebuild } from './rebuild.js';

export interface ValueSymbols {
  /** key (function and exact argument) -> symbol */
  readonly byKey: Map<string, string>;
  /** symbol -> the value it stands for (its argument in exact form) */
  readonly values: Map<string, Expr>;
}

export const newValueSymbols = (): ValueSymbols => ({ byKey: new Map(), values: new Map() });

/**
 * `e` with every admitted function value replaced by a symbol, or null when a value is not
 * admitted. `powersToo`: a power with a non-integer exponent is a value as well;
 * `keepForm`: a symbol stands for the value as written (else with its argument in exact form).
 */
export function valuesAsSymbols(e: Expr, symbols: ValueSymbols, admit: (fn: string) => boolean, powersToo = false, keepForm = false): Expr | null {
  const symbolFor = (key: string, value: Expr): Expr => {
    let s = symbols.byKey.get(key);
    if (!s) {
      s = `%value${symbols.byKey.size}`;
      symbols.byKey.set(key, s);
      symbols.values.set(s, value);
    }
    return { t: 'name', name: s };
  };
  return rebuild(e, {
    bin: (x, a, b) => {
      if (x.op === '^' && powersToo && !fromExpr({ t: 'bin', op: '^', a: { t: 'name', name: '%x' }, b })) {
        // a non-integer power: the base and exponent in exact form where they have one
        const rb = fromExpr(a); const re = fromExpr(b);
        const base = rb ? ratExpr(rb, true) : a; const exponent = re ? ratExpr(re, true) : b;
        return symbolFor(`^(${rb ? rfToString(rb) : formulaOf(a).text},${re ? rfToString(re) : formulaOf(b).text})`, keepForm ? x : { t: 'bin', op: '^', a: base, b: exponent });
      }
      return undefined;
    },
    call: (x, walk) => {
      if (!admit(x.fn) || x.args.length !== 1) return null;
      const arg = walk(x.args[0]!);
      const r = arg && fromExpr(arg);
      if (!r) return null;
      return symbolFor(`${x.fn}(${rfToString(r)})`, keepForm ? x : { t: 'call', fn: x.fn, args: [ratExpr(r, true)] });
    },
  });
}

/**
 * The same value with common factors cancelled, treating function values and non-integer
 * powers as symbols (kept as written); `e` itself when that fails or does not print at
 * least a tenth shorter.
 */
export function cancelled(e: Expr): Expr {
  const symbols = newValueSymbols();
  const s = valuesAsSymbols(e, symbols, () => true, true, true);
  const r = s && fromExpr(s);
  if (!r) return e;
  // the values as written go back in (exp(-2*pi*i*u) stays so)
  const out = substitute(ratExpr(r, true), symbols.values);
  // only a clear gain replaces the form as built (the shape of a standard formula is worth keeping)
  return formulaOf(out).text.length <= 0.9 * formulaOf(e).text.length ? out : e;
}

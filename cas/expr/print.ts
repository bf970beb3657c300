/** Plain infix text and KaTeX LaTeX of an expression, with the fewest parentheses that keep its meaning. */
import type { Expr } from '../lang/ast.js';
import type { Formula } from '../../shared/evaluation.js';
import { tidy } from './tidy.js';

const PREC = { add: 1, mul: 2, neg: 3, pow: 4, atom: 5 } as const;

function prec(e: Expr): number {
  switch (e.t) {
    case 'bin': return e.op === '+' || e.op === '-' ? PREC.add : e.op === '^' ? PREC.pow : PREC.mul;
    case 'neg': return PREC.neg;
    case 'num': return e.v.includes('/') ? PREC.mul : PREC.atom;
    default: return PREC.atom;
  }
}

/** The printed pair the record carries for a formula: infix text and LaTeX of the tidied expression. */
export function formulaOf(e: Expr): Formula {
  const t = tidy(e);
  return { text: toText(t), latex: toLatex(t) };
}

export function toText(e: Expr): string {
  const wrap = (x: Expr, p: boolean) => (p ? `(${toText(x)})` : toText(x));
  switch (e.t) {
    case 'num': return e.v;
    case 'const': return e.name;
    case 'name': return e.name;
    case 'neg': return `-${wrap(e.a, prec(e.a) <= PREC.neg && e.a.t !== 'bin' ? false : prec(e.a) < PREC.mul || e.a.t === 'neg')}`;
    case 'call': return `${e.fn}(${e.args.map(toText).join(', ')})`;
    case 'bin': {
      const pa = prec(e.a); const pb = prec(e.b);
      switch (e.op) {
        case '+': return `${toText(e.a)} + ${wrap(e.b, e.b.t === 'neg')}`;
        case '-': return `${toText(e.a)} - ${wrap(e.b, pb <= PREC.add || e.b.t === 'neg')}`;
        case '*': return `${wrap(e.a, pa < PREC.mul)}*${wrap(e.b, pb <= PREC.neg && !(pb === PREC.mul && e.b.t === 'bin' && e.b.op === '*'))}`;
        case '/': return `${wrap(e.a, pa < PREC.mul)}/${wrap(e.b, pb <= PREC.neg)}`;
        case '^': return `${wrap(e.a, pa <= PREC.pow)}^${wrap(e.b, pb < PREC.pow || e.b.t === 'bin')}`;
      }
    }
  }
  return '';
}

const GREEK = new Set([
  'alpha', 'beta', 'gamma', 'delta', 'epsilon', 'zeta', 'eta', 'theta', 'iota', 'kappa', 'lambda', 'mu', 'nu', 'xi',
  'rho', 'sigma', 'tau', 'upsilon', 'phi', 'chi', 'psi', 'omega', 'Gamma', 'Delta', 'Theta', 'Lambda', 'Xi', 'Sigma',
  'Phi', 'Psi', 'Omega',
]);

function latexName(n: string): string {
  const m = /^([A-Za-z]+)(?:_?([0-9]+)|_([A-Za-z0-9_]+))?$/.exec(n);
  const base = m?.[1] ?? n;
  const subscript = m?.[2] ?? m?.[3];
  const head = GREEK.has(base) ? `\\${base}` : base.length === 1 ? base : `\\mathit{${base.replace(/_/g, '\\_')}}`;
  if (!m) return `\\mathit{${n.replace(/_/g, '\\_')}}`;
  return subscript !== undefined ? `${head}_{${subscript.replace(/_/g, '\\_')}}` : head;
}

const FN_TEX: Record<string, string> = { tan: '\\tan', log: '\\log', sin: '\\sin', cos: '\\cos', sinh: '\\sinh', cosh: '\\cosh', exp: '\\exp', Gamma: '\\Gamma', asinh: '\\operatorname{arsinh}', eta: '\\eta' };

function startsWithDigit(tex: string): boolean { return /^[0-9]/.test(tex); }

export function toLatex(e: Expr): string {
  const paren = (x: Expr, p: boolean) => (p ? `\\left(${toLatex(x)}\\right)` : toLatex(x));
  switch (e.t) {
    case 'num': return e.v;
    case 'const': return e.name === 'pi' ? '\\pi' : e.name === 'i' ? 'i' : 'e';
    case 'name': return latexName(e.name);
    case 'neg': return `-${paren(e.a, prec(e.a) <= PREC.add)}`;
    case 'call': {
      const arg = e.args[0]!;
      if (e.fn === 'sqrt') return `\\sqrt{${toLatex(arg)}}`;
      if (e.fn === 'abs') return `\\left|${toLatex(arg)}\\right|`;
      if (e.fn === 'exp') {
        const inner = toLatex(arg);
        return inner.includes('\\frac') || inner.length > 40 ? `\\exp\\left(${inner}\\right)` : `e^{${inner}}`;
      }
      return `${FN_TEX[e.fn] ?? `\\operatorname{${e.fn}}`}\\left(${toLatex(arg)}\\right)`;
    }
    case 'bin': {
      const pa = prec(e.a); const pb = prec(e.b);
      switch (e.op) {
        case '+': return `${toLatex(e.a)} + ${paren(e.b, e.b.t === 'neg')}`;
        case '-': return `${toLatex(e.a)} - ${paren(e.b, pb <= PREC.add || e.b.t === 'neg')}`;
        case '*': {
          const left = paren(e.a, pa < PREC.mul);
          const right = paren(e.b, pb <= PREC.neg && !(e.b.t === 'bin' && e.b.op === '*'));
          const sep = startsWithDigit(right) || (e.b.t === 'bin' && e.b.op === '/' ) ? ' \\cdot ' : ' ';
          return `${left}${sep}${right}`;
        }
        case '/': return `\\frac{${toLatex(e.a)}}{${toLatex(e.b)}}`;
        case '^': {
          if (e.a.t === 'const' && e.a.name === 'e') return `e^{${toLatex(e.b)}}`;
          const base = e.a.t === 'call' && e.a.fn !== 'sqrt' && e.a.fn !== 'abs' ? `\\left(${toLatex(e.a)}\\right)` : paren(e.a, pa <= PREC.pow);
          return `${base}^{${toLatex(e.b)}}`;
        }
      }
    }
  }
  return '';
}

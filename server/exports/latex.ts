/**
 * The LaTeX appendix. Every string that a person wrote (title, statement source, note,
 * error message, reviewer name) goes through `texText` or `texSource`, which turn each
 * character into something LaTeX prints as that character: no user text can end an
 * environment, start a command or reach the file system, whoever compiles the file and
 * however. Formulas come from the computation (names there are [A-Za-z0-9_]); `safeMath`
 * still checks each against the commands the renderer makes and shows a note instead of
 * anything else. The appendix compiles with plain pdflatex (article, amsmath, amssymb;
 * OT1 fonts only, so no font has to be generated on the compiling machine).
 */
import type { StatementReport, WorksheetReport } from '../../shared/evaluation.js';
import type { StatementReviewDto } from '../../shared/collaboration.js';
import { renderStep } from '../../shared/record/render.js';

/**
 * A typewriter glyph by its ASCII code (cmtt has every printable ASCII character at its
 * code), after which a long run without spaces may break.
 */
const ttChar = (ch: string) => `{\\ttfamily\\char${ch.codePointAt(0)}}\\allowbreak{}`;

/** ASCII characters that are not themselves in LaTeX's roman text (special, or a ligature or another glyph there). */
const TEXT_ASCII: Record<string, string> = {
  '#': '\\#', $: ttChar('$'), '%': '\\%', '&': '\\&', _: ttChar('_'),
  '\\': ttChar('\\'), '{': ttChar('{'), '}': ttChar('}'), '~': ttChar('~'), '^': ttChar('^'),
  '<': ttChar('<'), '>': ttChar('>'), '|': ttChar('|'), '"': ttChar('"'), '`': ttChar('`'),
  // No ligatures (-- and ---, the Spanish !` ?`) and no line break at a hyphen: what was typed is what prints.
  '-': '\\mbox{-}', '!': '!{}', '?': '?{}', "'": "'{}", '/': '/\\allowbreak{}',
  '\n': ' ', '\r': ' ', '\t': ' ',
};

const math = (tex: string) => `\\ensuremath{${tex}}`;

/**
 * Characters outside ASCII that OT1 fonts print, by what prints them. Letters of
 * Latin-1 and Latin Extended-A go through as they are (LaTeX's utf8 input composes them)
 * unless they are listed in OT1_MISSING.
 */
const TEXT_UNICODE: Record<string, string> = {
  '\u00a0': '~', '¡': '\\textexclamdown{}', '¿': '\\textquestiondown{}', '£': '\\pounds{}', '§': '\\S{}', '¶': '\\P{}', '©': '\\copyright{}',
  '°': math('^\\circ'), '±': math('\\pm'), '×': math('\\times'), '÷': math('\\div'), '·': math('\\cdot'), 'µ': math('\\mu'), '¬': math('\\neg'),
  '¹': math('^1'), '²': math('^2'), '³': math('^3'), '«': math('\\ll'), '»': math('\\gg'),
  '‘': '`', '’': "'", '“': '``', '”': "''", '–': '--', '—': '---', '‐': '-', '‑': '-', '…': '\\ldots{}', '•': math('\\bullet'),
  '†': '\\dag{}', '‡': '\\ddag{}', '′': math("'"), '″': math("''"), '−': math('-'), '\u2009': '\\,', '\u200b': '',
  '≈': math('\\approx'), '≤': math('\\leq'), '≥': math('\\geq'), '≠': math('\\neq'), '≡': math('\\equiv'), '∼': math('\\sim'),
  '≃': math('\\simeq'), '≅': math('\\cong'), '∝': math('\\propto'), '≪': math('\\ll'), '≫': math('\\gg'), '≲': math('\\lesssim'), '≳': math('\\gtrsim'),
  '∞': math('\\infty'), '∫': math('\\int'), '∮': math('\\oint'), '∑': math('\\sum'), '∏': math('\\prod'), '√': math('\\surd'), '∂': math('\\partial'),
  '∇': math('\\nabla'), '→': math('\\to'), '←': math('\\leftarrow'), '↔': math('\\leftrightarrow'), '⇒': math('\\Rightarrow'), '⇐': math('\\Leftarrow'),
  '⇔': math('\\Leftrightarrow'), '↦': math('\\mapsto'), '∈': math('\\in'), '∉': math('\\notin'), '∋': math('\\ni'), '⊂': math('\\subset'), '⊆': math('\\subseteq'),
  '∪': math('\\cup'), '∩': math('\\cap'), '∖': math('\\setminus'), '∀': math('\\forall'), '∃': math('\\exists'), '∅': math('\\emptyset'), '⋅': math('\\cdot'),
  '∘': math('\\circ'), '⊗': math('\\otimes'), '⊕': math('\\oplus'), '∓': math('\\mp'), '∥': math('\\parallel'), '⊥': math('\\perp'), '∧': math('\\wedge'),
  '∨': math('\\vee'), '⟨': math('\\langle'), '⟩': math('\\rangle'), 'ℝ': math('\\mathbb{R}'), 'ℂ': math('\\mathbb{C}'),
  'ℕ': math('\\mathbb{N}'), 'ℤ': math('\\mathbb{Z}'), 'ℚ': math('\\mathbb{Q}'), 'ℏ': math('\\hbar'), 'ℓ': math('\\ell'), 'ℜ': math('\\Re'), 'ℑ': math('\\Im'),
  'ϕ': math('\\phi'), 'ϵ': math('\\epsilon'), 'ϑ': math('\\vartheta'),
};
// Greek from U+0391/U+03B1 on; capitals that look like Latin letters print as those.
const GREEK_SMALL = ['alpha', 'beta', 'gamma', 'delta', 'epsilon', 'zeta', 'eta', 'theta', 'iota', 'kappa', 'lambda', 'mu', 'nu', 'xi', 'o', 'pi', 'rho', 'varsigma', 'sigma', 'tau', 'upsilon', 'varphi', 'chi', 'psi', 'omega'];
const GREEK_CAPITAL = ['A', 'B', 'Gamma', 'Delta', 'E', 'Z', 'H', 'Theta', 'I', 'K', 'Lambda', 'M', 'N', 'Xi', 'O', 'Pi', 'P', '', 'Sigma', 'T', 'Upsilon', 'Phi', 'X', 'Psi', 'Omega'];
GREEK_SMALL.forEach((name, k) => {
  TEXT_UNICODE[String.fromCodePoint(0x3b1 + k)] = name.length === 1 ? name : math(`\\${name}`);
  const cap = GREEK_CAPITAL[k]!;
  if (cap) TEXT_UNICODE[String.fromCodePoint(0x391 + k)] = cap.length === 1 ? cap : math(`\\${cap}`);
});

/** Letters LaTeX's utf8 input knows but OT1 fonts cannot print (they need T1 fonts). */
const OT1_MISSING = new Set('ÐÞðþĄąĐđĘęĦħĮįĸĿŀŉŊŋŦŧŲųſ');

/** A character that has no OT1 rendering: its code point, so the text stays readable and exact. */
const codePointMark = (ch: string) => `{\\ttfamily[U+${ch.codePointAt(0)!.toString(16).toUpperCase().padStart(4, '0')}]}`;

function texChar(ch: string): string {
  const ascii = TEXT_ASCII[ch];
  if (ascii !== undefined) return ascii;
  const code = ch.codePointAt(0)!;
  if (code >= 0x20 && code < 0x7f) return ch;
  const known = TEXT_UNICODE[ch];
  if (known !== undefined) return known;
  if (code >= 0xc0 && code <= 0x17f && !OT1_MISSING.has(ch)) return ch;
  return codePointMark(ch);
}

/** Escapes text for LaTeX's text mode, one character at a time. */
export function texText(s: string): string {
  let out = '';
  for (const ch of s) out += texChar(ch);
  return out;
}

/**
 * A statement's source as it was written, in typewriter type, each line its own line:
 * every ASCII mark is printed by its glyph number, spaces keep their count, and nothing
 * in it can end the block (there is no end delimiter to write, unlike verbatim).
 */
export function texSource(source: string): string {
  const lines = source.replace(/\r\n?/g, '\n').split('\n').map((line) => {
    let out = '';
    let column = 0;
    for (const ch of line) {
      if (ch === ' ' || ch === '\t') {
        const width = ch === '\t' ? 4 - (column % 4) : 1;
        // A single space between words may break the line; the rest keep their width.
        out += out === '' || out.endsWith('\\ ') || out.endsWith(' ') ? '\\ '.repeat(width) : ` ${'\\ '.repeat(width - 1)}`;
        column += width;
        continue;
      }
      column += 1;
      const code = ch.codePointAt(0)!;
      if (/[A-Za-z0-9]/.test(ch)) out += ch;
      // A mark by its glyph number; a long line may break after it (but not after a hyphen).
      else if (code > 0x20 && code < 0x7f) out += ch === '-' ? '\\mbox{-}' : `{\\char${code}}\\allowbreak{}`;
      else if (code < 0x20 || code === 0x7f) out += codePointMark(ch);
      else out += texChar(ch);
    }
    return out === '' ? '\\mbox{}' : out;
  });
  return `\\begin{flushleft}\\ttfamily\\frenchspacing\n${lines.join('\\\\\n')}\n\\end{flushleft}`;
}

/** Control words the renderer and the computation put into formulas. */
const MATH_COMMANDS = new Set([
  'Delta', 'approx', 'arg', 'begin', 'end', 'cdot', 'cos', 'cosh', 'cup', 'det', 'exp', 'frac', 'ge', 'geq', 'in', 'infty', 'le', 'leq', 'left', 'right', 'lim',
  'log', 'mathbb', 'mathit', 'mathrm', 'neq', 'ne', 'not', 'operatorname', 'pi', 'pm', 'mp', 'prod', 'quad', 'qquad', 'setminus', 'sim', 'sin', 'sinh', 'sqrt',
  'succ', 'succeq', 'sum', 'tan', 'text', 'to', 'times', 'ldots', 'cdots', 'Re', 'Im', 'infty', 'lambda',
  'alpha', 'beta', 'gamma', 'delta', 'epsilon', 'zeta', 'eta', 'theta', 'iota', 'kappa', 'mu', 'nu', 'xi', 'rho', 'sigma', 'tau', 'upsilon',
  'phi', 'chi', 'psi', 'omega', 'Gamma', 'Theta', 'Lambda', 'Xi', 'Sigma', 'Phi', 'Psi', 'Omega',
  'langle', 'rangle', 'partial', 'int', 'overline', 'bar',
]);
const MATH_ENVIRONMENTS = new Set(['pmatrix', 'matrix', 'cases', 'aligned']);

/**
 * The formula when it is made only of what the renderer makes: known control words,
 * escaped marks, printable ASCII without TeX's comment, parameter, math-shift and
 * `^^` characters, and environments from a short list. Anything else is not put into
 * the file (the step's words, printed beside it, still say it).
 */
export function safeMath(latex: string): string {
  const omitted = '\\text{(formula not shown)}';
  if (/[^\x20-\x7e]|[%#$~]|\^\^/.test(latex)) return omitted;
  for (const m of latex.matchAll(/\\([A-Za-z]+|.?)/g)) {
    const name = m[1]!;
    if (/^[A-Za-z]/.test(name) ? !MATH_COMMANDS.has(name) : !/^[ ,;:!{}_\\|]$/.test(name)) return omitted;
  }
  for (const m of latex.matchAll(/\\(?:begin|end)(\s*\{[^}]*\})?/g)) {
    if (!MATH_ENVIRONMENTS.has(m[1]?.replace(/[\s{}]/g, '') ?? '')) return omitted;
  }
  return latex;
}

/** A statement's name in math mode (names are letters, digits and underscores). */
const mathName = (name: string) => `\\mathit{${texText(name)}}`;

const verdictWords: Record<string, string> = {
  unreviewed: 'not reviewed',
  requested: 'review requested',
  confirmed: 'confirmed by a reviewer',
  disputed: 'disputed by a reviewer',
};

function statementSection(s: StatementReport, review: StatementReviewDto | undefined): string {
  const out: string[] = [];
  out.push(`\\paragraph{Line ${s.line}${s.name ? ` (${texText(s.name)})` : ''}.}`);
  out.push(texSource(s.source));
  if (s.error) out.push(`\\noindent\\textbf{Error:} ${texText(s.error.message)}\n`);
  if (s.convergence) {
    out.push(`\\noindent Convergence: ${texText(s.convergence)} (${s.proof === 'proved' ? 'proved' : 'checked at sampled points, not proved'}).\n`);
  }
  if (s.result) out.push(`\\[ ${s.name ? `${mathName(s.name)} = ` : ''}${safeMath(s.result.latex)} \\]`);
  // The branch verdict's reasons are its branch step, rendered like every other step.
  const branchStep = s.branch ? s.steps.find((step) => step.kind === 'branch') : undefined;
  if (branchStep) out.push(`\\noindent Branch: ${texText(renderStep(branchStep).text)}\n`);
  if (s.steps.length) {
    out.push('\\begin{enumerate}');
    for (const step of s.steps) {
      const { text, latex } = renderStep(step);
      out.push(`  \\item ${texText(text)}${latex ? `\\\\ \\( ${safeMath(latex)} \\)` : ''}`);
    }
    out.push('\\end{enumerate}');
  }
  const status = review?.status ?? 'unreviewed';
  const decided = review?.reviews.find((r) => !r.stale && r.status === status);
  out.push(`\\noindent Review: ${verdictWords[status] ?? texText(status)}${decided ? ` (${texText(decided.reviewer)}, ${texText(decided.decidedAt?.slice(0, 10) ?? '')})` : ''}.\n`);
  return out.join('\n');
}

/**
 * A standalone appendix (article class, amsmath and amssymb) with each statement, its
 * result, its numbered steps and their reasons, and its review status.
 */
export function latexAppendix(o: { title: string; version: number; report: WorksheetReport; reviews: StatementReviewDto[] }): string {
  const byLine = new Map(o.reviews.map((r) => [r.line, r]));
  const body = o.report.statements
    .filter((s) => s.kind !== 'note' || s.steps.length)
    .map((s) => statementSection(s, byLine.get(s.line)))
    .join('\n\n');
  return [
    '\\documentclass{article}',
    '\\usepackage{amsmath}',
    '\\usepackage{amssymb}',
    '\\begin{document}',
    `\\section*{Appendix: ${texText(o.title)}}`,
    `Worksheet version ${Number(o.version)}, exported from Sheetwise. Verdicts marked` + " ``checked at sampled points'' " + 'rest on numerical sampling and are checks, not proofs.',
    '',
    body,
    '\\end{document}',
    '',
  ].join('\n');
}

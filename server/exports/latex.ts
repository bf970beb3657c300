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
import { nameLatex, renderStep } from '../../shared/record/render.js';

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

/** A statement's name in math mode as the card and the record set it (nameLatex); anything but letters, digits and underscores is left out. */
const mathName = (name: string) => {
  const clean = name.replace(/[^A-Za-z0-9_]/g, '').replace(/^_+|_+$/g, '');
  return clean ? nameLatex(clean) : '\\mathrm{?}';
};

const verdictWords: Record<string, string> = {
  unreviewed: 'not reviewed',
  requested: 'review requested',
  confirmed: 'confirmed by a reviewer',
  disputed: 'disputed by a reviewer',
};

const day = (iso: string | null | undefined) => (iso ? texText(iso.slice(0, 10)) : '');

/**
 * The review status in words: who decided and when, or of whom it was requested and
 * when (a request has no decision date), or "not reviewed".
 */
export function reviewWords(review: StatementReviewDto | undefined, names = true): string {
  const status = review?.status ?? 'unreviewed';
  const fresh = (review?.reviews ?? []).filter((r) => !r.stale);
  if (status === 'requested') {
    const asked = fresh.filter((r) => r.status === 'requested');
    if (!asked.length) return verdictWords['requested']!;
    const whom = names ? asked.map((r) => texText(r.reviewer)).join(', ') : `${asked.length} reviewer${asked.length === 1 ? '' : 's'}`;
    const when = asked.map((r) => r.requestedAt).sort()[0];
    return `review requested of ${whom} on ${day(when)}, no verdict yet`;
  }
  const decided = fresh.find((r) => r.status === status);
  if (!decided) return verdictWords[status] ?? texText(status);
  const who = names ? [texText(decided.reviewer)] : [];
  if (decided.decidedAt) who.push(day(decided.decidedAt));
  return `${verdictWords[status] ?? texText(status)}${who.length ? ` (${who.join(', ')})` : ''}`;
}

/** A note's text: its note step (the statement's source would print it a second time). */
const noteText = (s: StatementReport) => s.steps.flatMap((step) => (step.kind === 'note' ? [step.text] : [])).join(' ');

/**
 * The displayed relation of a result: a limit statement shows its limit step's own
 * formula (`\lim ... =` for a value, `\sim` for leading behaviour or a divergence), every
 * other result `NAME = formula`.
 */
function resultEquation(s: StatementReport): string | null {
  const limit = s.steps.find((step) => step.kind === 'limit');
  if (s.kind === 'limit' && limit) {
    if (limit.outcome === 'unknown' || limit.outcome === 'oscillating') return null;
    return renderStep(limit).latex ?? null;
  }
  if (!s.result) return null;
  // A comparison's result is the ratio of its two names (its report name is "A, B").
  const pair = s.kind === 'compare' ? s.name?.split(', ') : undefined;
  if (pair?.length === 2) return `\\frac{${mathName(pair[0]!)}}{${mathName(pair[1]!)}} = ${s.result.latex}`;
  return `${s.name ? `${mathName(s.name)} = ` : ''}${s.result.latex}`;
}

function statementSection(s: StatementReport, review: StatementReviewDto | undefined, names: boolean): string {
  const out: string[] = [];
  out.push(`\\paragraph{Line ${s.line}${s.name ? ` (${texText(s.name)})` : ''}.}`);
  if (s.kind === 'note') {
    // The note once, as its line was typed (not its line and its step both).
    out.push(texSource(s.source || noteText(s)));
    return out.join('\n');
  }
  out.push(texSource(s.source));
  if (s.error) out.push(`\\noindent\\textbf{Error:} ${texText(s.error.message)}\n`);
  if (s.convergence) {
    out.push(`\\noindent Convergence: ${texText(s.convergence)} (${s.proof === 'proved' ? 'proved' : 'checked at sampled points, not proved'}).\n`);
  }
  const equation = resultEquation(s);
  if (equation) out.push(`\\[ ${safeMath(equation)} \\]`);
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
  out.push(`\\noindent Review: ${reviewWords(review, names)}.\n`);
  return out.join('\n');
}

interface ExportInput {
  title: string;
  version: number;
  report: WorksheetReport;
  reviews: StatementReviewDto[];
  /** false: review states without the reviewers' names (for a referee outside the group). */
  reviewerNames?: boolean;
}

/** The record statement by statement: source, result, numbered steps with their reasons, review. */
function recordBody(o: ExportInput): string {
  const byLine = new Map(o.reviews.map((r) => [r.line, r]));
  return o.report.statements
    .filter((s) => s.kind !== 'note' || noteText(s))
    .map((s) => statementSection(s, byLine.get(s.line), o.reviewerNames !== false))
    .join('\n\n');
}

const PREAMBLE = ['\\documentclass{article}', '\\usepackage{amsmath}', '\\usepackage{amssymb}', '\\begin{document}'];

/**
 * A standalone appendix (article class, amsmath and amssymb) with each statement, its
 * result, its numbered steps and their reasons, and its review status.
 */
export function latexAppendix(o: ExportInput): string {
  return [
    ...PREAMBLE,
    `\\section*{Appendix: ${texText(o.title)}}`,
    `Worksheet version ${Number(o.version)}, exported from Sheetwise. Verdicts marked` + " ``checked at sampled points'' " + 'rest on numerical sampling and are checks, not proofs.',
    '',
    recordBody(o),
    '\\end{document}',
    '',
  ].join('\n');
}

/** Statements whose result a paper states as an equation. */
const RESULT_KINDS = new Set(['integral', 'rotate', 'continue', 'let', 'moment', 'derivative', 'limit']);
/** Statements that check a result: listed after the equations, with their verdicts. */
const CHECK_KINDS = new Set(['expect', 'verify', 'compare']);
/** Which steps are remarks of which sort. */
const REMARK_OF: Partial<Record<string, 'Conditions' | 'Branch' | 'Contour'>> = {
  convergence: 'Conditions', legality: 'Conditions',
  branch: 'Branch', sheet: 'Branch', 'continuation-event': 'Branch',
  rotation: 'Contour', 'fresnel-phase': 'Contour', continuation: 'Contour', jacobian: 'Contour', variables: 'Contour',
};

/** An equation label: only letters, digits and colons, so any paper can \eqref it. */
const labelOf = (prefix: string, s: StatementReport) => `${prefix.replace(/[^A-Za-z0-9]/g, '')}:L${s.line}${s.name ? `:${s.name.replace(/[^A-Za-z0-9]/g, '')}` : ''}`;

/**
 * The fragment to \input into a paper (it needs amsmath and amssymb, which most papers
 * load): the parameters and their domains, each result as a numbered equation with a
 * label, and after it its conditions, branch and contour choices and review status as
 * remarks; then the checks (expect, verify, compare) with their verdicts, and the notes
 * once each. No preamble, no sections and no definitions, so it sits inside any
 * document class; everything it prints is in a group of its own.
 */
export function latexFragment(o: ExportInput & { labelPrefix?: string; notes?: boolean }): string {
  const prefix = o.labelPrefix ?? `sheetwise-v${Number(o.version)}`;
  const byLine = new Map(o.reviews.map((r) => [r.line, r]));
  const out: string[] = [
    `% Sheetwise record: version ${Number(o.version)} of a worksheet (the title is printed below).`,
    '% \\input this file into a document that loads amsmath and amssymb. Equation labels:',
    `% ${prefix.replace(/[^A-Za-z0-9]/g, '')}:L<line>:<name>.`,
    '\\begingroup',
    `\\noindent\\textbf{${texText(o.title)}} (Sheetwise worksheet, version ${Number(o.version)}).`,
  ];
  const params = o.report.statements.flatMap((s) => s.steps.filter((step) => step.kind === 'param').map((step) => renderStep(step).latex)).filter((x): x is string => !!x);
  if (params.length) out.push(`Parameters: ${params.map((p) => `\\(${safeMath(p)}\\)`).join('; ')}.`);
  out.push('\\par');
  const checks: string[] = [];
  const notes: string[] = [];
  const errors: string[] = [];
  for (const s of o.report.statements) {
    if (s.kind === 'note') {
      const text = noteText(s);
      if (text && o.notes !== false) notes.push(texText(text));
      continue;
    }
    if (s.error) {
      errors.push(`line ${s.line}: ${texText(s.error.message)}`);
      continue;
    }
    if (CHECK_KINDS.has(s.kind)) {
      const last = s.steps[s.steps.length - 1];
      if (last) checks.push(`line ${s.line}${s.name ? ` (${texText(s.name)})` : ''}: ${texText(renderStep(last).text)}`);
      continue;
    }
    if (!RESULT_KINDS.has(s.kind)) continue;
    const equation = resultEquation(s);
    const remarks: Record<'Conditions' | 'Branch' | 'Contour', string[]> = { Conditions: [], Branch: [], Contour: [] };
    if (s.convergence && !s.steps.some((step) => step.kind === 'convergence')) remarks.Conditions.push(`convergence ${texText(s.convergence)}, ${s.proof === 'proved' ? 'proved on the whole declared domain' : 'checked at sampled points, not proved'}`);
    for (const step of s.steps) {
      const sort = REMARK_OF[step.kind];
      if (sort) remarks[sort].push(texText(renderStep(step).text));
    }
    if (s.kind === 'rotate' && s.legal === false) remarks.Conditions.push('the rotation is not allowed, so no result is stated');
    if (equation) {
      out.push('\\begin{equation}', `  ${safeMath(equation)}`, `  \\label{${labelOf(prefix, s)}}`, '\\end{equation}');
    } else {
      out.push(`\\noindent Line ${s.line}${s.name ? ` (${texText(s.name)})` : ''}: no closed form.\\par`);
    }
    const parts = [
      ...(['Conditions', 'Branch', 'Contour'] as const).filter((k) => remarks[k].length).map((k) => `\\emph{${k}:} ${remarks[k].join(' ')}`),
      `\\emph{Review:} ${reviewWords(byLine.get(s.line), o.reviewerNames !== false)}.`,
    ];
    out.push(`{\\small\\noindent\\textit{Remarks (line ${s.line}).} ${parts.join(' ')}\\par}`);
  }
  if (checks.length) out.push('\\medskip\\noindent\\textit{Checks.}', '\\begin{itemize}', ...checks.map((c) => `  \\item ${c}`), '\\end{itemize}');
  if (errors.length) out.push('\\noindent\\textit{Not evaluated.}', '\\begin{itemize}', ...errors.map((c) => `  \\item ${c}`), '\\end{itemize}');
  if (notes.length) out.push('\\noindent\\textit{Notes.}', '\\begin{itemize}', ...notes.map((c) => `  \\item ${c}`), '\\end{itemize}');
  out.push('\\endgroup', '');
  return out.join('\n');
}

/**
 * The wrapper that compiles on its own: article class with amsmath and amssymb, the
 * fragment (the same text a paper would \input), then the whole record statement by
 * statement. This is what the referee page's PDF is made from.
 */
export function latexStandalone(o: ExportInput & { labelPrefix?: string }): string {
  return [
    ...PREAMBLE,
    `\\section*{${texText(o.title)}}`,
    `Worksheet version ${Number(o.version)}, exported from Sheetwise. Verdicts marked` + " ``checked at sampled points'' " + 'rest on numerical sampling and are checks, not proofs.',
    '',
    '\\subsection*{Results}',
    // The notes print once, in the record where they stand.
    latexFragment({ ...o, notes: false }),
    '\\subsection*{The record}',
    recordBody(o),
    '\\end{document}',
    '',
  ].join('\n');
}

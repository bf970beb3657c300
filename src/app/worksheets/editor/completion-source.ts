// What the editor offers and explains, all from the language's own lists in shared/language.ts
// (no second copy of the language) and the names the parser reported (the report's `symbols`).
import {
  CLAUSE_WORDS,
  CONSTANTS,
  CONSTANT_NAMES,
  COUNT_DOMAIN,
  DOMAINS,
  DOMAIN_HELP,
  FUNCTIONS,
  FUNCTION_NAMES,
  STATEMENTS,
  STATEMENT_KEYWORDS,
  type Domain,
  type FunctionName,
  type StatementKeyword,
} from '@shared/language';
import type { WorksheetSymbols } from '@shared/evaluation';

export type CompletionKind = 'keyword' | 'clause' | 'domain' | 'function' | 'constant' | 'result' | 'parameter' | 'variable';

export interface CompletionEntry {
  label: string;
  kind: CompletionKind;
  detail: string;
  /** Sorts the list: names first, then words of the language. */
  sort: string;
}

/** Where the cursor is, as far as completion cares. */
export type CompletionContext = 'line-start' | 'domain' | 'expression';

/**
 * The context from the text before the word being typed: at the start of a line a statement
 * keyword; after `param NAMES :` a domain; anywhere else names, functions and constants.
 * Plain string tests on the line; the parser's verdict on the line comes with the report.
 */
export function completionContext(before: string): CompletionContext {
  const t = before.trim();
  if (!t) return 'line-start';
  if (`${t} `.startsWith('param ') && t.endsWith(':')) return 'domain';
  return 'expression';
}

export function completionEntries(context: CompletionContext, symbols: WorksheetSymbols | null): CompletionEntry[] {
  if (context === 'line-start') {
    return STATEMENT_KEYWORDS.map((k) => ({ label: k, kind: 'keyword', detail: STATEMENTS[k].form, sort: `0${k}` }));
  }
  if (context === 'domain') {
    const domains: CompletionEntry[] = DOMAINS.map((d) => ({ label: d, kind: 'domain', detail: DOMAIN_HELP[d], sort: `0${d}` }));
    // Sorted just after `positive`, which it extends.
    return [...domains, { label: COUNT_DOMAIN.label, kind: 'domain', detail: COUNT_DOMAIN.help, sort: '0positive integer' }];
  }
  const out: CompletionEntry[] = [];
  const seen = new Set<string>();
  const add = (e: CompletionEntry) => {
    if (!seen.has(e.label)) (seen.add(e.label), out.push(e));
  };
  for (const r of symbols?.results ?? []) add({ label: r.name, kind: 'result', detail: `result (line ${r.line})`, sort: `1${r.name}` });
  for (const p of symbols?.params ?? []) add({ label: p.name, kind: 'parameter', detail: `parameter, ${p.domain}`, sort: `1${p.name}` });
  for (const v of symbols?.variables ?? []) add({ label: v, kind: 'variable', detail: 'integration variable', sort: `2${v}` });
  for (const w of CLAUSE_WORDS) add({ label: w, kind: 'clause', detail: 'keyword', sort: `3${w}` });
  for (const f of FUNCTION_NAMES) add({ label: f, kind: 'function', detail: FUNCTIONS[f], sort: `4${f}` });
  for (const c of CONSTANT_NAMES) add({ label: c, kind: 'constant', detail: CONSTANTS[c], sort: `4${c}` });
  return out;
}

/** The hover of a word in Markdown: the language's help for its words, the value for a result, the domain for a parameter. */
export function hoverMarkdown(word: string, results: ReadonlyMap<string, string>, symbols: WorksheetSymbols | null): string | null {
  const value = results.get(word);
  if (value !== undefined) return `**${word}** = \`${value.replaceAll('`', "'")}\``;
  const param = symbols?.params.find((p) => p.name === word);
  if (param) return `**${word}**: parameter, ${DOMAIN_HELP[param.domain]} (line ${param.line})`;
  if (symbols?.variables.includes(word)) return `**${word}**: integration variable`;
  if (Object.hasOwn(STATEMENTS, word)) {
    const s = STATEMENTS[word as StatementKeyword];
    return `**${word}**: ${s.help}\n\n\`${s.form}\`\n\nExample: \`${s.example}\`\n\n[Worked example in the language reference](${globalThis.location?.origin ?? ''}/language#${word})`;
  }
  if (Object.hasOwn(FUNCTIONS, word)) return `**${word}**(…): ${FUNCTIONS[word as FunctionName]}`;
  if (Object.hasOwn(CONSTANTS, word)) return `**${word}**: ${CONSTANTS[word as keyof typeof CONSTANTS]}`;
  if ((DOMAINS as readonly string[]).includes(word)) return `**${word}**: ${DOMAIN_HELP[word as Domain]}`;
  return null;
}

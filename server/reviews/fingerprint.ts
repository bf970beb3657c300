import { createHash } from 'node:crypto';
import { statementNames, type ParsedLine, type Statement } from '../../cas/index.js';
import { parseSource } from '../evaluation/parse-source.js';
import { sourceLines, withoutComment, collapseSpaces } from '../evaluation/source-lines.js';

/** One statement of a worksheet as review sees it: a stable key and what it depends on. */
export interface ReviewableStatement {
  /** The result name for statements that define one, else the statement's text. */
  key: string;
  line: number;
  text: string;
  /** Hash of the statement's syntax tree and, recursively, of the definition of every name it uses. */
  fingerprint: string;
}

const sha = (s: string) => createHash('sha256').update(s).digest('hex');

/** The tree without positions: moving a statement or re-spacing it is no change. */
const treeText = (statement: Statement) => JSON.stringify(statement, (key, value) => (key === 'span' ? undefined : value));

interface Entry {
  line: number;
  text: string;
  own: string;
  defined: string[];
  used: string[];
  /** Per name a param line declares, its domain: a name's definition is its own name and domain only. */
  paramDomains?: Map<string, string>;
}

/**
 * The statements of a worksheet with their fingerprints, read from the parser's trees.
 * A review is stale when the fingerprint of its statement changes: the statement
 * itself, or the definition of any name it uses (a param's domain, a let, an
 * integral a compare uses), recursively. Notes and comments change nothing; a line
 * that does not parse is keyed and hashed by its text.
 */
export function reviewableStatements(source: string): ReviewableStatement[] {
  const rows = sourceLines(source);
  const entries: Entry[] = [];
  // A source too deep for the parser reads as lines of text, each its own statement.
  const parsedLines: ParsedLine[] =
    parseSource(source)?.lines ??
    rows.flatMap((row, i) => (collapseSpaces(withoutComment(row)) ? [{ ok: false as const, line: i + 1, kind: 'invalid', error: { message: '', line: i + 1, column: 1 } }] : []));
  for (const parsed of parsedLines) {
    if (parsed.ok) {
      const statement = parsed.statement;
      if (statement.kind === 'note') continue;
      const names = statementNames(statement);
      const text = collapseSpaces(source.slice(statement.span.start.offset, statement.span.end.offset));
      const paramDomains = statement.kind === 'param' ? new Map(names.defined.map((n) => [n, statement.integer ? `${statement.domain} integer` : statement.domain] as const)) : undefined;
      entries.push({ line: parsed.line, text, own: treeText(statement), defined: names.defined, used: names.used, paramDomains });
    } else {
      if (parsed.kind === 'note') continue;
      const text = collapseSpaces(withoutComment(rows[parsed.line - 1] ?? ''));
      entries.push({ line: parsed.line, text, own: `unparsed:${text}`, defined: [], used: [] });
    }
  }

  // The first definition of a name is the one the core uses.
  const definitions = new Map<string, Entry>();
  for (const e of entries) for (const n of e.defined) if (!definitions.has(n)) definitions.set(n, e);

  const memo = new Map<Entry, string>();
  const fingerprintOf = (e: Entry, seen: Set<Entry>): string => {
    const cached = memo.get(e);
    if (cached) return cached;
    seen.add(e);
    const uses = [...new Set(e.used)]
      .filter((n) => !e.defined.includes(n))
      .sort()
      .map((n) => `${n}:${definitionOf(n, seen)}`);
    const fp = sha(`${e.own}\n${uses.join('\n')}`);
    memo.set(e, fp);
    return fp;
  };
  // A name on a multi-name param line depends on its own domain only, not its neighbours'.
  const definitionOf = (name: string, seen: Set<Entry>): string => {
    const def = definitions.get(name);
    if (!def) return 'undefined';
    const domain = def.paramDomains?.get(name);
    if (domain !== undefined) return sha(`param ${name} : ${domain}`);
    return seen.has(def) ? 'cycle' : fingerprintOf(def, seen);
  };

  const keys = new Map<string, number>();
  return entries.map((e) => {
    let key = e.defined[0] ?? e.text;
    // Two identical unnamed statements (say, the same expect twice) get numbered keys.
    const count = keys.get(key) ?? 0;
    keys.set(key, count + 1);
    if (count) key = `${key} (${count + 1})`;
    return { key, line: e.line, text: e.text, fingerprint: fingerprintOf(e, new Set()) };
  });
}

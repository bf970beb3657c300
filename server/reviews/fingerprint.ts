import { createHash } from 'node:crypto';

/** One statement of a worksheet as review sees it: a stable key and what it depends on. */
export interface ReviewableStatement {
  /** The result name for statements that define one, else the kind and the text. */
  key: string;
  line: number;
  text: string;
  /** Hash of the statement's text and, recursively, of everything it uses. */
  fingerprint: string;
}

const NAME = /[A-Za-z_][A-Za-z0-9_]*/g;

/** The name a statement defines, if any: param, integral and let name, rotate's `as`. */
function definedName(code: string): string | null {
  const direct = /^(?:param|integral|let)\s+([A-Za-z_][A-Za-z0-9_]*)/.exec(code);
  if (direct) return direct[1];
  const renamed = /^rotate\b.*\bas\s+([A-Za-z_][A-Za-z0-9_]*)\s*$/.exec(code);
  return renamed ? renamed[1] : null;
}

const normalize = (line: string) => line.replace(/#.*$/, '').replace(/\s+/g, ' ').trim();
const sha = (s: string) => createHash('sha256').update(s).digest('hex');

/**
 * The statements of a worksheet with their fingerprints. A review is stale when the
 * fingerprint of its statement changes: the statement's own text, or the text of
 * any statement it refers to by name (a param's domain, an integral a compare uses).
 * Notes and comments change nothing.
 */
export function reviewableStatements(source: string): ReviewableStatement[] {
  const lines = source.split('\n').map((raw, index) => ({ line: index + 1, code: normalize(raw) })).filter((l) => l.code && !l.code.startsWith('note'));
  const definitions = new Map<string, { line: number; code: string }>();
  for (const l of lines) {
    const name = definedName(l.code);
    if (name && !definitions.has(name)) definitions.set(name, l);
  }
  const memo = new Map<number, string>();
  const fingerprintOf = (l: { line: number; code: string }, seen: Set<number>): string => {
    const cached = memo.get(l.line);
    if (cached) return cached;
    seen.add(l.line);
    const own = definedName(l.code);
    const uses = [...new Set(l.code.replace(/"[^"]*"/g, '').match(NAME) ?? [])]
      .filter((n) => n !== own && definitions.has(n))
      .sort()
      .map((n) => {
        const dep = definitions.get(n)!;
        return seen.has(dep.line) ? `${n}:cycle` : `${n}:${fingerprintOf(dep, seen)}`;
      });
    const fp = sha(`${l.code}\n${uses.join('\n')}`);
    memo.set(l.line, fp);
    return fp;
  };
  const keys = new Map<string, number>();
  return lines.map((l) => {
    const name = definedName(l.code);
    let key = name ?? l.code;
    // Two identical unnamed statements (say, the same expect twice) get numbered keys.
    const count = keys.get(key) ?? 0;
    keys.set(key, count + 1);
    if (count) key = `${key} (${count + 1})`;
    return { key, line: l.line, text: l.code, fingerprint: fingerprintOf(l, new Set()) };
  });
}

/**
 * Character-level reading of worksheet lines for what the parser's trees do not keep:
 * the text of a line the parser rejected, and a line's length and bracket depth, which
 * are measured before parsing because the parser recurses per bracket and per operator
 * (a long enough line overflows its stack). Plain loops, no patterns: the language's
 * syntax lives in the grammar only.
 */

/** The source's lines, as the parser numbers them (line n is index n - 1). */
export function sourceLines(source: string): string[] {
  return source.split('\n').map((l) => (l.endsWith('\r') ? l.slice(0, -1) : l));
}

/** A line without its `#` comment; a `#` inside a note's quotes is text. */
export function withoutComment(line: string): string {
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    const ch = line[i];
    if (ch === '"') quoted = !quoted;
    else if (ch === '#' && !quoted) return line.slice(0, i);
  }
  return line;
}

const isSpace = (ch: string) => ch === ' ' || ch === '\t' || ch === '\r' || ch === '\n' || ch === '\f' || ch === '\v';

/** Runs of white space as one space, none at either end. */
export function collapseSpaces(text: string): string {
  let out = '';
  let pending = false;
  for (const ch of text) {
    if (isSpace(ch)) {
      pending = out.length > 0;
      continue;
    }
    if (pending) out += ' ';
    pending = false;
    out += ch;
  }
  return out;
}

/**
 * A line's computed length (characters outside quotes, before its comment) and the
 * deepest nesting of its parentheses.
 */
export function measureLine(line: string): { length: number; depth: number } {
  let depth = 0;
  let deepest = 0;
  let length = 0;
  let quoted = false;
  for (const ch of line) {
    if (ch === '"') quoted = !quoted;
    else if (quoted) continue;
    else if (ch === '#') break;
    else if (ch === '(') deepest = Math.max(deepest, ++depth);
    else if (ch === ')') depth--;
    length++;
  }
  return { length, depth: deepest };
}

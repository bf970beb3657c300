import { parseWorksheet, type ParsedWorksheet } from '../../cas/index.js';

/**
 * The parser's reading of a worksheet, or null when the parser ran out of stack: it
 * recurses once per nesting level of `^`, unary minus and brackets, so a long enough
 * chain (thousands of levels, well within the length limit) overflows it. The server
 * parses in its main thread and must not fail a request on that.
 */
export function parseSource(source: string): ParsedWorksheet | null {
  try {
    return parseWorksheet(source);
  } catch (err) {
    if (err instanceof RangeError) return null;
    throw err;
  }
}

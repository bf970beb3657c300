// Types of the parser that scripts/build-grammar.mjs generates from line.peggy.
export interface ParseOptions { startRule?: 'Line' | 'Expr'; line?: number; offset?: number; internal?: boolean }
export function parse(input: string, options?: ParseOptions): unknown;
export const StartRules: string[];
export class SyntaxError extends Error {}

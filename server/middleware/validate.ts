import type { z } from 'zod';
import { HttpError } from './http-error.js';

/**
 * A 400 for text holding U+0000: PostgreSQL cannot store it in text, and it is never
 * part of a worksheet, title or note. Says where it is and what to do.
 */
export function nulCharacterError(field: string, text: string): HttpError {
  const at = text.indexOf('\u0000');
  const before = text.slice(0, Math.max(0, at));
  const where = at >= 0 ? ` at line ${before.split('\n').length}, column ${before.length - before.lastIndexOf('\n')}` : '';
  const message = `${field}: The text has a NUL character (U+0000)${where}, which cannot be stored. It usually comes from pasted binary data or terminal output: delete it (or save the text again as plain UTF-8) and send it again.`;
  return new HttpError(400, 'nul_character', message);
}

/** The path of the first string in `input` (a parsed JSON body or query) that holds U+0000. */
function findNul(input: unknown, path: string[] = [], depth = 0): { path: string; text: string } | null {
  if (typeof input === 'string') return input.includes('\u0000') ? { path: path.join('.'), text: input } : null;
  if (depth > 32 || input === null || typeof input !== 'object') return null;
  for (const [key, value] of Object.entries(input)) {
    const inKey = key.includes('\u0000') ? { path: [...path, key.replace(/\u0000/g, '\\0')].join('.'), text: key } : null;
    const found = inKey ?? findNul(value, [...path, key], depth + 1);
    if (found) return found;
  }
  return null;
}

/**
 * Parses input with a shared zod schema; a failure is a 400 naming each bad field. Text
 * with a NUL character is refused first, for every route, with where it is.
 */
export function parseInput<S extends z.ZodType>(schema: S, input: unknown): z.infer<S> {
  const nul = findNul(input);
  if (nul) throw nulCharacterError(nul.path || '(body)', nul.text);
  const result = schema.safeParse(input ?? {});
  if (result.success) return result.data;
  const details = result.error.issues.map((issue) => ({
    path: issue.path.join('.') || '(body)',
    message: friendlyIssue(issue),
  }));
  const message = details.map((d) => (d.path === '(body)' ? d.message : `${d.path}: ${d.message}`)).join(' ');
  throw new HttpError(400, 'invalid_input', message, { error: { code: 'invalid_input', message, details } });
}

function friendlyIssue(issue: z.core.$ZodIssue): string {
  if (issue.code === 'invalid_type' && /undefined/.test(issue.message)) return 'This field is required.';
  if (issue.code === 'too_big' && issue.origin === 'string') return `Use at most ${issue.maximum} characters.`;
  return issue.message;
}

/** Parses a positive integer route parameter; anything else is a 404. */
export function idParam(value: unknown, what: string): number {
  const id = Number(value);
  if (!Number.isInteger(id) || id <= 0 || id > 2_147_483_647) throw new HttpError(404, 'not_found', `${what} was not found. Check the address.`);
  return id;
}

/** A route parameter by name (Express types them loosely under mergeParams). */
export const routeParam = (req: { params: unknown }, name: string): string | undefined => (req.params as Record<string, string>)[name];

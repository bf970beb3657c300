import type { z } from 'zod';
import { HttpError } from './http-error.js';

/** Parses input with a shared zod schema; a failure is a 400 naming each bad field. */
export function parseInput<S extends z.ZodType>(schema: S, input: unknown): z.infer<S> {
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

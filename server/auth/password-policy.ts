import { readFileSync } from 'node:fs';
import { LIMITS } from '../../shared/api.js';
import { HttpError } from '../middleware/http-error.js';

/**
 * The rules for a newly chosen password (registration, reset, sign-up through an
 * invitation). Existing passwords (the demo accounts' included) are not checked at
 * sign-in: the policy applies only when a password is chosen.
 */
export const PASSWORD_MIN = Math.max(12, LIMITS.passwordMin);

const COMMON = new Set(
  readFileSync(new URL('./common-passwords.txt', import.meta.url), 'utf8')
    .split('\n')
    .map((l) => l.trim())
    .filter((l) => l && !l.startsWith('#')),
);

const ADVICE = 'A phrase of three or four unrelated words is long and easy to remember.';

/** The reason a password is refused, as a sentence that says what to do; null when it is fine. */
export function passwordProblem(password: string, email: string): string | null {
  const chars = [...password];
  if (chars.length < PASSWORD_MIN) return `Use a password of at least ${PASSWORD_MIN} characters. ${ADVICE}`;
  if (chars.length > LIMITS.passwordMax) return `Use a password of at most ${LIMITS.passwordMax} characters.`;
  if (!password.trim()) return `A password of spaces only is too easy to guess. ${ADVICE}`;
  if (new Set(chars).size < 5 || /^(.{1,6})\1+$/su.test(password)) {
    return `This password repeats a few characters, so it is guessed at once. ${ADVICE}`;
  }
  const lower = password.trim().toLowerCase();
  const address = email.trim().toLowerCase();
  const local = address.split('@')[0] ?? '';
  if (address && lower.includes(address)) return 'Do not use your e-mail address in the password: it is the first thing tried.';
  // The address's name part may be a small part of a longer password, not most of it.
  if (local.length >= 3 && [...lower.split(local).join('')].length < 8) {
    return `This password is mostly your e-mail address's name ("${local}"), which is the first thing tried. ${ADVICE}`;
  }
  const cores = new Set([lower, lower.replace(/[\d\W_]+$/u, ''), lower.replace(/^[\d\W_]+/u, ''), lower.replace(/^[\d\W_]+|[\d\W_]+$/gu, '')]);
  if ([...cores].some((c) => COMMON.has(c))) {
    return `This password is on the list of common passwords, which are guessed first. ${ADVICE}`;
  }
  return null;
}

/** Throws 400 with the reason when a newly chosen password breaks the policy. */
export function assertPasswordAllowed(password: string, email: string): void {
  const problem = passwordProblem(password, email);
  if (!problem) return;
  const message = `password: ${problem}`;
  throw new HttpError(400, 'weak_password', message, { error: { code: 'weak_password', message, details: [{ path: 'password', message: problem }] } });
}

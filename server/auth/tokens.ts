import { createHash, randomBytes } from 'node:crypto';

/** A long random token for a link; only its SHA-256 is stored, so a database leak gives no working links. */
export function newToken(): { token: string; hash: string } {
  const token = randomBytes(32).toString('base64url');
  return { token, hash: hashToken(token) };
}

export const hashToken = (token: string) => createHash('sha256').update(token).digest('hex');

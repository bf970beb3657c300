import { createHmac } from 'node:crypto';
import bcrypt from 'bcryptjs';

/** bcrypt with cost 10: about 50 ms a hash here, slow enough to hurt guessing. */
const COST = 10;

/**
 * Stored hashes are versioned. `sw2$<bcrypt>` (the current format) is bcrypt over the
 * base64 HMAC-SHA-256 of the password: 44 ASCII bytes whatever the password's length, so
 * bcrypt's cut at 72 bytes never drops a part of it. A bare `$2…` hash is the first
 * format (bcrypt over the password itself); it still verifies and is replaced at the
 * next successful sign-in (`needsRehash`).
 */
const PREFIX = 'sw2$';
// Not a secret (it only fixes the pre-hash's length); a changed key would break every hash.
const PREHASH_KEY = 'sheetwise-password-prehash-v2';

const prehash = (password: string) => createHmac('sha256', PREHASH_KEY).update(password, 'utf8').digest('base64');

export const hashPassword = async (password: string) => PREFIX + (await bcrypt.hash(prehash(password), COST));

export function checkPassword(password: string, stored: string): Promise<boolean> {
  if (stored.startsWith(PREFIX)) return bcrypt.compare(prehash(password), stored.slice(PREFIX.length));
  return bcrypt.compare(password, stored);
}

/** True for hashes of an older format, which are upgraded when the password is next given. */
export const needsRehash = (stored: string) => !stored.startsWith(PREFIX);

/** A hash of a random password, to compare against when the address is unknown (same work as a real check). */
export const DUMMY_HASH = 'sw2$$2b$10$3Wx32JJ6kY/B0eNvUPwUY.8WuNBxnsOUTbEGKYei4QmYUPR3U4Hk6';

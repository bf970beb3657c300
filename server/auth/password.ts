import { createHmac, randomBytes, scrypt, timingSafeEqual } from 'node:crypto';
import { promisify } from 'node:util';
import bcrypt from 'bcryptjs';

/**
 * Stored hashes are versioned.
 *
 * `sw3$N$r$p$<salt>$<key>` (the current format) is scrypt from node:crypto: it runs on the
 * libuv thread pool, so a sign-in never holds the event loop. bcryptjs, which the earlier
 * formats used, computes on the main thread in one ~95 ms slice per hash (its async API
 * yields only every 100 ms), stalling every other request during each sign-in.
 * N = 2^15, r = 8, p = 1: 32 MiB and about 100 ms a hash here, memory-hard as well as slow.
 * The parameters are stored with the hash, so raising them later upgrades at sign-in.
 *
 * `sw2$<bcrypt>` is bcrypt over the base64 HMAC-SHA-256 of the password (44 ASCII bytes, so
 * bcrypt's cut at 72 bytes never drops a part of it); a bare `$2…` hash is bcrypt over the
 * password itself. Both still verify and are replaced at the next successful sign-in
 * (`needsRehash`).
 */
const PREFIX = 'sw3$';
const N = 2 ** 15;
const R = 8;
const P = 1;
const KEY_BYTES = 32;
// Node refuses scrypt above maxmem (default 32 MiB); 128*N*r is exactly 32 MiB, plus headroom.
const MAX_MEM = 64 * 2 ** 20;

const LEGACY_PREFIX = 'sw2$';
// Not a secret (it only fixes the pre-hash's length); a changed key would break every sw2 hash.
const PREHASH_KEY = 'sheetwise-password-prehash-v2';
const prehash = (password: string) => createHmac('sha256', PREHASH_KEY).update(password, 'utf8').digest('base64');

const scryptAsync = promisify(scrypt) as (password: string | Buffer, salt: Buffer, keylen: number, options: { N: number; r: number; p: number; maxmem: number }) => Promise<Buffer>;

export async function hashPassword(password: string): Promise<string> {
  const salt = randomBytes(16);
  const key = await scryptAsync(Buffer.from(password, 'utf8'), salt, KEY_BYTES, { N, r: R, p: P, maxmem: MAX_MEM });
  return `${PREFIX}${N}$${R}$${P}$${salt.toString('base64')}$${key.toString('base64')}`;
}

export async function checkPassword(password: string, stored: string): Promise<boolean> {
  if (stored.startsWith(PREFIX)) {
    const [n, r, p, salt, key] = stored.slice(PREFIX.length).split('$');
    const expected = Buffer.from(key ?? '', 'base64');
    if (!salt || expected.length === 0) return false;
    const got = await scryptAsync(Buffer.from(password, 'utf8'), Buffer.from(salt, 'base64'), expected.length, { N: Number(n), r: Number(r), p: Number(p), maxmem: MAX_MEM });
    return timingSafeEqual(got, expected);
  }
  if (stored.startsWith(LEGACY_PREFIX)) return bcrypt.compare(prehash(password), stored.slice(LEGACY_PREFIX.length));
  return bcrypt.compare(password, stored);
}

/** True for hashes of an older format or weaker parameters, which are upgraded when the password is next given. */
export const needsRehash = (stored: string) => !stored.startsWith(`${PREFIX}${N}$${R}$${P}$`);

/** Random salt and key in the current shape (no password is known to give it), checked against when the address is unknown: the same work as a real check. */
export const DUMMY_HASH = 'sw3$32768$8$1$fIp7xV1mH0b2rW2k3pS0Dg==$3m0C2a6yA3v5fJb8KxQ2o7X9q1tYw4zR5uE6iN8hL0c=';

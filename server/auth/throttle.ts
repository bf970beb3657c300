/**
 * Sign-in back-off, kept in PostgreSQL (table sign_in_throttle) so that every server
 * process sharing the database counts the same failures.
 *
 * Three counters are consulted before a password is even checked:
 * - `pair`    (account address + client address): `pairFree` failures are free; after that
 *   each further try waits 1, 2, 4, … seconds after the last failure (at most 15 minutes).
 * - `address` (client address across all accounts, unknown addresses included):
 *   `addressFree` failures free, then the same doubling wait. This slows spraying many
 *   accounts from one place.
 * - `account` (the account address, from any client): after `accountFree` failures the
 *   account is held back for client addresses it never signed in from: they wait 1, 2,
 *   4, … minutes (at most an hour) after the last failure, and a mailed unlock link (or a
 *   password reset) lifts this at once. Addresses the account signed in from before
 *   (sign_in_addresses, 90 days) are not held back by it, so a stranger's guesses cannot
 *   keep the owner out of their own account from their own address.
 *
 * Every try is counted as a failure before the password is checked (so parallel tries
 * cannot slip past a count); a success takes its count back and clears the account's
 * counters. Counters are forgotten after an idle hour (24 hours for the account).
 * Keys are normalised: addresses trimmed and lower-cased, IPv6 clients by their /64.
 */
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';

export type Scope = 'account' | 'address' | 'pair';

export interface ThrottleLimits {
  pairFree: number;
  addressFree: number;
  accountFree: number;
}

interface Rule {
  unitSeconds: number;
  capSeconds: number;
  forgetSeconds: number;
}

const RULES: Record<Scope, Rule> = {
  pair: { unitSeconds: 1, capSeconds: 15 * 60, forgetSeconds: 3600 },
  address: { unitSeconds: 1, capSeconds: 15 * 60, forgetSeconds: 3600 },
  account: { unitSeconds: 60, capSeconds: 3600, forgetSeconds: 24 * 3600 },
};

const FAMILIAR_DAYS = 90;

export const normaliseEmail = (email: string) => email.trim().toLowerCase();

/** A client address as a key: IPv4 as is (also when IPv4-mapped), IPv6 by its /64 network. */
export function clientKey(ip: string | undefined): string {
  const raw = (ip ?? 'unknown').trim().toLowerCase();
  const mapped = /^::ffff:(\d+\.\d+\.\d+\.\d+)$/.exec(raw);
  if (mapped) return mapped[1];
  if (!raw.includes(':')) return raw;
  const [head, tail = ''] = raw.split('::');
  const h = head ? head.split(':') : [];
  const t = tail ? tail.split(':') : [];
  const groups = raw.includes('::') ? [...h, ...Array(Math.max(0, 8 - h.length - t.length)).fill('0'), ...t] : h;
  return groups.slice(0, 4).map((g) => g.replace(/^0+(?=.)/, '')).join(':') + '::/64';
}

/** Seconds to wait after `failures` failures before the next try, or 0. */
export function waitSeconds(scope: Scope, failures: number, free: number): number {
  if (failures < free) return 0;
  const rule = RULES[scope];
  return Math.min(rule.capSeconds, rule.unitSeconds * 2 ** Math.min(30, failures - free));
}

/** Forgets an account's counters: its own, and its per-client-address ones. */
export async function clearAccountCounters(sequelize: Sequelize, email: string, transaction?: Transaction): Promise<void> {
  const account = normaliseEmail(email);
  await sequelize.query(
    `UPDATE sign_in_throttle SET failures = 0 WHERE (scope = 'account' AND key = $1) OR (scope = 'pair' AND left(key, length($1) + 1) = $1 || '|')`,
    { bind: [account], transaction },
  );
}

export type Reservation =
  | { ok: true; accountFailures: number }
  | { ok: false; reason: 'throttled' | 'locked'; retryAfter: number };

export class SignInThrottle {
  constructor(
    private readonly sequelize: Sequelize,
    readonly limits: ThrottleLimits,
  ) {}

  private keys(email: string, address: string): [Scope, string][] {
    const account = normaliseEmail(email);
    // Sorted as the locks are taken (scope, key), so that two tries never wait on each other in a circle.
    return [
      ['account', account],
      ['address', address],
      ['pair', `${account}|${address}`],
    ];
  }

  private free(scope: Scope): number {
    return scope === 'account' ? this.limits.accountFree : scope === 'address' ? this.limits.addressFree : this.limits.pairFree;
  }

  /**
   * Counts a try against all three counters when none of them asks to wait; otherwise
   * counts nothing and says how long to wait. `familiar`: the client address signed in
   * to this account before (the account's own back-off does not apply then).
   */
  async reserve(email: string, address: string, familiar: boolean): Promise<Reservation> {
    const keys = this.keys(email, address);
    if (Math.random() < 0.01) await this.prune();
    // The rows exist before the transaction locks them (each insert commits at once).
    for (const [scope, key] of keys) {
      await this.sequelize.query(
        `INSERT INTO sign_in_throttle (scope, key, failures, last_failed_at) VALUES ($1, $2, 0, now()) ON CONFLICT DO NOTHING`,
        { bind: [scope, key], type: QueryTypes.INSERT },
      );
    }
    return withDeadlockRetry(() => this.sequelize.transaction(async (transaction) => {
      const rows = await this.sequelize.query<{ scope: Scope; key: string; failures: number; idle: number }>(
        `SELECT scope, key, failures, EXTRACT(EPOCH FROM (now() - last_failed_at))::float8 AS idle
           FROM sign_in_throttle WHERE (scope, key) IN (($1, $2), ($3, $4), ($5, $6))
           ORDER BY scope, key FOR UPDATE`,
        { bind: keys.flat(), type: QueryTypes.SELECT, transaction },
      );
      const refusals: { reason: 'throttled' | 'locked'; wait: number }[] = [];
      const next = new Map<Scope, number>();
      for (const row of rows) {
        const failures = row.idle > RULES[row.scope].forgetSeconds ? 0 : row.failures;
        next.set(row.scope, failures + 1);
        if (row.scope === 'account' && familiar) continue;
        const wait = waitSeconds(row.scope, failures, this.free(row.scope)) - row.idle;
        if (failures >= this.free(row.scope) && wait > 0) refusals.push({ reason: row.scope === 'account' ? 'locked' : 'throttled', wait });
      }
      if (refusals.length) {
        // A throttle (429) is said before a lock; the longest wait is the one that counts.
        const reason = refusals.some((r) => r.reason === 'throttled') ? 'throttled' : 'locked';
        return { ok: false as const, reason, retryAfter: Math.ceil(Math.max(...refusals.map((r) => r.wait))) } satisfies Reservation;
      }
      for (const [scope, key] of keys) {
        await this.sequelize.query(`UPDATE sign_in_throttle SET failures = $3, last_failed_at = now() WHERE scope = $1 AND key = $2`, {
          bind: [scope, key, next.get(scope) ?? 1],
          transaction,
        });
      }
      return { ok: true as const, accountFailures: next.get('account') ?? 1 };
    }));
  }

  /**
   * A successful sign-in takes its try back from every counter and ends the counter of
   * this account and client address. The account's own counter ends too unless the
   * account is being held back: then only time, the unlock link or a reset end it (an
   * owner signing in from a known address does not reopen the account to a stranger).
   * True when the account's counter ended.
   */
  async succeeded(email: string, address: string): Promise<boolean> {
    const [account, addr, pair] = this.keys(email, address);
    await this.sequelize.query(`UPDATE sign_in_throttle SET failures = GREATEST(failures - 1, 0) WHERE scope = 'address' AND key = $1`, { bind: [addr[1]] });
    // Counters are set to 0 rather than deleted: a row that vanishes and comes back would be
    // locked out of order by a concurrent reserve(), which can deadlock under a storm of sign-ins.
    await this.sequelize.query(`UPDATE sign_in_throttle SET failures = 0 WHERE scope = 'pair' AND key = $1`, { bind: [pair[1]] });
    const [, ended] = await this.sequelize.query(`UPDATE sign_in_throttle SET failures = 0 WHERE scope = 'account' AND key = $1 AND failures <= $2`, {
      bind: [account[1], this.limits.accountFree],
    }) as [unknown, { rowCount?: number } | number];
    if ((typeof ended === 'number' ? ended : ended?.rowCount ?? 0) > 0) return true;
    await this.sequelize.query(`UPDATE sign_in_throttle SET failures = GREATEST(failures - 1, 0) WHERE scope = 'account' AND key = $1`, { bind: [account[1]] });
    return false;
  }

  /** Unlock link or password reset: the account's own and per-address counters end. */
  clearAccount(email: string, transaction?: Transaction): Promise<void> {
    return clearAccountCounters(this.sequelize, email, transaction);
  }

  async isFamiliar(userId: number, address: string): Promise<boolean> {
    const [row] = await this.sequelize.query<{ n: number }>(
      `SELECT 1 AS n FROM sign_in_addresses WHERE user_id = $1 AND address = $2 AND last_signed_in_at > now() - make_interval(days => $3)`,
      { bind: [userId, address, FAMILIAR_DAYS], type: QueryTypes.SELECT },
    );
    return Boolean(row);
  }

  async remember(userId: number, address: string): Promise<void> {
    await this.sequelize.query(
      `INSERT INTO sign_in_addresses (user_id, address, last_signed_in_at) VALUES ($1, $2, now())
       ON CONFLICT (user_id, address) DO UPDATE SET last_signed_in_at = now()`,
      { bind: [userId, address] },
    );
  }

  /** Old rows go (idle for longer than any counter remembers). */
  async prune(): Promise<void> {
    await this.sequelize.query(`DELETE FROM sign_in_throttle WHERE last_failed_at < now() - interval '25 hours'`);
  }
}

/**
 * Runs a transaction again when PostgreSQL ends it as a deadlock victim (40P01) or a
 * serialization failure (40001): the common practice for row-locking transactions, so a
 * storm of sign-ins on one address never turns into a 500.
 */
async function withDeadlockRetry<T>(run: () => Promise<T>, attempts = 5): Promise<T> {
  for (let k = 1; ; k++) {
    try {
      return await run();
    } catch (e) {
      const code = (e as { parent?: { code?: string }; original?: { code?: string } }).parent?.code ?? (e as { original?: { code?: string } }).original?.code;
      if (k >= attempts || (code !== '40P01' && code !== '40001')) throw e;
      await new Promise((r) => setTimeout(r, 5 + Math.random() * 20 * k));
    }
  }
}

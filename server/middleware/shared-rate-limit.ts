/**
 * express-rate-limit with its counts in PostgreSQL (table `rate_limit_hits`, migration
 * 0013) instead of one process's memory: a department runs several server processes
 * behind one proxy, and a limit each of them counted alone would be that many times
 * looser. A fixed window per limiter and client key; one upsert per counted request.
 * express-rate-limit keeps its own logic (keys, headers, the 429 answer); only the store
 * is ours. No published store fitted: the ones for PostgreSQL bring their own schema
 * migrations and connection pools.
 */
import { rateLimit, type ClientRateLimitInfo, type Options, type Store } from 'express-rate-limit';
import { QueryTypes } from 'sequelize';
import { Evaluation } from '../models/index.js';

const db = () => Evaluation.sequelize!;

/** A limiter's counts in PostgreSQL; `name` keeps each limiter's keys apart. */
export class PostgresRateLimitStore implements Store {
  private windowMs = 60_000;
  readonly prefix: string;
  // the counts are shared between processes: express-rate-limit must not assume they are local
  readonly localKeys = false;

  constructor(name: string) {
    this.prefix = `${name}:`;
  }

  init(options: Options): void {
    this.windowMs = options.windowMs;
  }

  async get(key: string): Promise<ClientRateLimitInfo | undefined> {
    const [row] = await db().query<{ hits: number; reset_at: Date }>(
      'SELECT hits, reset_at FROM rate_limit_hits WHERE key = $1 AND reset_at > now()',
      { bind: [this.prefix + key], type: QueryTypes.SELECT },
    );
    return row ? { totalHits: row.hits, resetTime: row.reset_at } : undefined;
  }

  async increment(key: string): Promise<ClientRateLimitInfo> {
    // a window that has run out starts again at 1
    const [row] = await db().query<{ hits: number; reset_at: Date }>(
      `INSERT INTO rate_limit_hits AS r (key, hits, reset_at)
         VALUES ($1, 1, now() + make_interval(secs => $2::double precision / 1000))
       ON CONFLICT (key) DO UPDATE SET
         hits = CASE WHEN r.reset_at <= now() THEN 1 ELSE r.hits + 1 END,
         reset_at = CASE WHEN r.reset_at <= now() THEN EXCLUDED.reset_at ELSE r.reset_at END
       RETURNING hits, reset_at`,
      { bind: [this.prefix + key, this.windowMs], type: QueryTypes.SELECT },
    );
    // now and then, forget windows that ended long ago (any process may do it)
    if (Math.random() < 0.01) void db().query("DELETE FROM rate_limit_hits WHERE reset_at < now() - interval '1 day'").catch(() => undefined);
    return { totalHits: row!.hits, resetTime: row!.reset_at };
  }

  async decrement(key: string): Promise<void> {
    await db().query('UPDATE rate_limit_hits SET hits = greatest(hits - 1, 0) WHERE key = $1 AND reset_at > now()', { bind: [this.prefix + key] });
  }

  async resetKey(key: string): Promise<void> {
    await db().query('DELETE FROM rate_limit_hits WHERE key = $1', { bind: [this.prefix + key] });
  }
}

/** A rate limit counted in PostgreSQL, answering 429 with `message` and the draft-8 headers. */
export function sharedRateLimit(name: string, windowMs: number, limit: number, message: string) {
  return rateLimit({
    windowMs,
    limit,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    store: new PostgresRateLimitStore(name),
    message: { error: { code: 'rate_limited', message } },
    // when the database is away the request goes on to its route, which reports that
    passOnStoreError: true,
  });
}

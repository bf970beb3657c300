/**
 * The session store: connect-pg-simple's, with one change. Reading a session also reads
 * its account, in the same query, so a signed-in request costs one round trip to
 * PostgreSQL before its route instead of two (the session, then passport's account
 * lookup). The account row travels to `deserializeUser` (passport.ts) in the request's
 * async context; a request whose context has no row (or another account's) falls back to
 * the lookup by id, so nothing depends on this shortcut for correctness.
 */
import { AsyncLocalStorage } from 'node:async_hooks';
import type { RequestHandler } from 'express';
import session from 'express-session';
import connectPgSimple from 'connect-pg-simple';
import type pg from 'pg';
import type { SiteRole } from '../../shared/api.js';

/** The users row as the User model's attributes (camel-case names). */
export interface AccountRow {
  id: number;
  email: string;
  displayName: string;
  passwordHash: string;
  siteRole: SiteRole;
  disabled: boolean;
  failedSignIns: number;
  lockedAt: Date | null;
  createdAt: Date;
  updatedAt: Date;
}

const requestAccount = new AsyncLocalStorage<{ row: AccountRow | null }>();

/** Opens the per-request slot the store fills; mount before express-session. */
export const accountSlot: RequestHandler = (_req, _res, next) => requestAccount.run({ row: null }, next);

/** The account read with this request's session, when it is the one asked for. */
export function prefetchedAccount(id: number): AccountRow | null {
  const row = requestAccount.getStore()?.row ?? null;
  return row && row.id === id ? row : null;
}

const SESSION_WITH_ACCOUNT = `
  SELECT s.sess, u.id, u.email, u.display_name AS "displayName", u.password_hash AS "passwordHash",
         u.site_role AS "siteRole", u.disabled, u.failed_sign_ins AS "failedSignIns",
         u.locked_at AS "lockedAt", u.created_at AS "createdAt", u.updated_at AS "updatedAt"
    FROM session s
    LEFT JOIN users u
      ON u.id = CASE WHEN s.sess #>> '{passport,user}' ~ '^[0-9]{1,9}$' THEN (s.sess #>> '{passport,user}')::int END
   WHERE s.sid = $1 AND s.expire >= now()`;

export function createSessionStore(pool: pg.Pool): session.Store {
  const PgStore = connectPgSimple(session);
  class SessionWithAccountStore extends PgStore {
    override get(sid: string, fn: (err: unknown, session?: session.SessionData | null) => void): void {
      pool.query(SESSION_WITH_ACCOUNT, [sid]).then(
        ({ rows: [row] }) => {
          if (!row) return fn(null, null);
          const { sess, ...account } = row as { sess: session.SessionData | string } & AccountRow;
          const slot = requestAccount.getStore();
          if (slot && account.id !== null) slot.row = account;
          try {
            fn(null, typeof sess === 'string' ? JSON.parse(sess) : sess);
          } catch {
            this.destroy(sid, (err) => fn(err ?? null, null));
          }
        },
        (err: unknown) => fn(err),
      );
    }
  }
  return new SessionWithAccountStore({ pool, tableName: 'session', createTableIfMissing: false, disableTouch: true });
}

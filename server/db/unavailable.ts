// Whether an error means "the database cannot be reached just now" (answered with 503)
// rather than a fault in our code (500). Decided from codes, not message wording:
// SQLSTATE class 08 (connection exception) and 57P01–57P03 (the server shutting down,
// crashed, or not yet accepting connections), the socket errors of a refused or cut
// connection, and the connection errors of Sequelize's pool.
const SOCKET_CODES = new Set(['ECONNREFUSED', 'ECONNRESET', 'EPIPE', 'ETIMEDOUT', 'EHOSTUNREACH', 'ENOTFOUND']);
const SHUTDOWN_STATES = new Set(['57P01', '57P02', '57P03']);
const SEQUELIZE_CONNECTION_ERRORS = /^Sequelize(Connection\w*|ConnectionAcquireTimeout)Error$/;
// pg's own wording for a client whose socket went away (no code is attached to these).
const PG_DEAD_CLIENT = /^(Connection terminated|Client has encountered a connection error|Client was closed)/;

interface ErrorLike { name?: unknown; code?: unknown; message?: unknown; parent?: unknown; original?: unknown; cause?: unknown }

function matches(err: ErrorLike): boolean {
  const code = typeof err.code === 'string' ? err.code : '';
  if (SOCKET_CODES.has(code) || SHUTDOWN_STATES.has(code) || code.startsWith('08')) return true;
  if (typeof err.name === 'string' && SEQUELIZE_CONNECTION_ERRORS.test(err.name)) return true;
  return typeof err.message === 'string' && PG_DEAD_CLIENT.test(err.message);
}

export function isDatabaseUnavailable(err: unknown): boolean {
  // Sequelize wraps the driver's error in `parent`/`original`; Node in `cause`.
  for (let e = err as ErrorLike | undefined, depth = 0; e && typeof e === 'object' && depth < 4; depth++) {
    if (matches(e)) return true;
    e = (e.parent ?? e.original ?? e.cause) as ErrorLike | undefined;
  }
  return false;
}

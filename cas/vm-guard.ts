/**
 * A statement that never reaches a deadline check (one long step in the core) is stopped by
 * V8 itself: code run through vm with a timeout is terminated when it runs over, and the
 * caller goes on with the next statement instead of losing its thread. The context is empty;
 * `run` is the only thing it can see. Used by the server's evaluation workers and by the
 * command line's workers alike.
 */
import vm from 'node:vm';
import { TimeLimitError } from './deadline.js';

const sandbox = vm.createContext({ run: null as unknown });
/** Time beyond the limit for the deadline checks to stop the statement first, with their own words. */
const GRACE_MS = 250;

/** run() under a hard time limit of limitMs (+ grace); an infinite limit runs it as it is. */
export function guarded<T>(run: () => T, limitMs: number): T {
  if (!Number.isFinite(limitMs)) return run();
  sandbox['run'] = run;
  try {
    return vm.runInContext('run()', sandbox, { timeout: Math.max(1, Math.ceil(limitMs + GRACE_MS)) }) as T;
  } catch (err) {
    if ((err as { code?: string })?.code === 'ERR_SCRIPT_EXECUTION_TIMEOUT') throw new TimeLimitError(limitMs);
    throw err;
  } finally {
    sandbox['run'] = null;
  }
}

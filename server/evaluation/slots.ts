/**
 * The cap on running and queued evaluations per owner (an account, or a referee link),
 * counted in PostgreSQL so that every server process on the database sees the same
 * count. Taking a slot is one call of a database function that takes an advisory lock on
 * the owner, counts and inserts (migration 0012);
 * the slot is deleted when its evaluation ends (done, failed or cancelled). A process
 * renews the slots it holds every few seconds, so the slots of a process that died
 * expire within SLOT_TTL_S and are not counted.
 */
import type { Response } from 'express';
import { QueryTypes } from 'sequelize';
import { Evaluation } from '../models/index.js';
import { HttpError } from '../middleware/http-error.js';

const SLOT_TTL_S = 30;
const RENEW_EVERY_MS = 10_000;

const db = () => Evaluation.sequelize!;
const held = new Set<string>();
let renewer: NodeJS.Timeout | undefined;

function renewHeld(): void {
  if (!held.size) {
    clearInterval(renewer);
    renewer = undefined;
    return;
  }
  db()
    .query(`UPDATE evaluation_slots SET expires_at = now() + make_interval(secs => ${SLOT_TTL_S}) WHERE id = ANY($1::bigint[])`, { bind: [[...held]] })
    .catch(() => undefined); // the database is away: the slots expire, which is what we want
}

/**
 * One slot transaction per owner at a time in this process: the others wait here, not in
 * PostgreSQL on the advisory lock, where each would hold one of the pool's few
 * connections and make every other request (the worksheet list) wait for one.
 */
const turns = new Map<string, Promise<unknown>>();
function oneAtATime<T>(owner: string, work: () => Promise<T>): Promise<T> {
  const next = (turns.get(owner) ?? Promise.resolve()).then(work);
  const tail = next.catch(() => undefined);
  turns.set(owner, tail);
  void tail.then(() => {
    if (turns.get(owner) === tail) turns.delete(owner);
  });
  return next;
}

export interface Slot {
  release: () => Promise<void>;
}

/** Who an evaluation is for: the key of its slots and of its turn in the pool. */
export const userOwner = (userId: number) => `user:${userId}`;
export const refereeOwner = (linkId: number) => `referee:${linkId}`;

/**
 * Takes one of the owner's `cap` slots, or answers 429 with Retry-After (set on `res`)
 * naming the cap. The hint is at most 10 s: most evaluations end in seconds, and the
 * oldest one ends by its budget (`budgetMs`) at the latest.
 */
export async function takeSlot(res: Response, owner: string, cap: number, budgetMs: number): Promise<Slot> {
  // One round trip: the lock, the count and the insert run inside PostgreSQL (migration 0012).
  const outcome = await oneAtATime(owner, async () => {
    const [row] = await db().query<{ slot_id: string | null; running: number; oldest_ms: number | null }>(
      'SELECT slot_id::text AS slot_id, running, oldest_ms FROM take_evaluation_slot($1, $2, $3)',
      { bind: [owner, cap, SLOT_TTL_S], type: QueryTypes.SELECT },
    );
    return row!.slot_id === null ? { full: true as const, oldestMs: row!.oldest_ms ?? 0 } : { full: false as const, id: row!.slot_id };
  });
  if (outcome.full) {
    // The oldest running evaluation ends by its budget at the latest; most end far sooner.
    const untilBudget = Math.ceil((budgetMs - outcome.oldestMs) / 1000);
    const retryAfter = Math.min(10, Math.max(1, untilBudget));
    res.set('retry-after', String(retryAfter));
    const who = owner.startsWith('referee:') ? 'this referee link' : 'you';
    throw new HttpError(
      429,
      'too_many_evaluations',
      `${who === 'you' ? 'You have' : 'This referee link has'} ${cap} evaluations running or waiting, the most at once. Wait for one to finish (try again in ${retryAfter} s), or cancel one.`,
      { retryAfterSeconds: retryAfter },
    );
  }
  const id = outcome.id;
  held.add(id);
  renewer ??= setInterval(renewHeld, RENEW_EVERY_MS).unref();
  let released = false;
  return {
    release: async () => {
      if (released) return;
      released = true;
      held.delete(id);
      await db()
        .query('DELETE FROM evaluation_slots WHERE id = $1', { bind: [id] })
        .catch(() => undefined); // expires on its own
    },
  };
}

/** Queries of accounts: registration, unlocking, password resets and the admin's list. */
import { QueryTypes, UniqueConstraintError, type Transaction } from 'sequelize';
import { RESET_MINUTES } from '../../shared/collaboration.js';
import { hashPassword } from '../auth/password.js';
import { assertPasswordAllowed } from '../auth/password-policy.js';
import { clearAccountCounters } from '../auth/throttle.js';
import { hashToken, newToken } from '../auth/tokens.js';
import type { Mailer } from '../mail/mailer.js';
import { passwordResetMail } from '../mail/templates.js';
import { HttpError, notFound } from '../middleware/http-error.js';
import { PasswordReset, User } from '../models/index.js';

const EMAIL_TAKEN = 'An account with this e-mail address exists already. Sign in instead, or ask for a new password if you forgot it.';

/** A unique-constraint failure on users.email means someone registered the address at the same moment. */
export function emailTakenOnRace(err: unknown): never {
  if (err instanceof UniqueConstraintError) throw new HttpError(409, 'email_taken', EMAIL_TAKEN);
  throw err;
}

export async function register(o: { email: string; displayName: string; password: string }): Promise<User> {
  assertPasswordAllowed(o.password, o.email);
  if (await User.findOne({ where: { email: o.email } })) throw new HttpError(409, 'email_taken', EMAIL_TAKEN);
  const passwordHash = await hashPassword(o.password);
  return User.create({ email: o.email, displayName: o.displayName, passwordHash }).catch(emailTakenOnRace);
}

/** Uses an unlock token (single use, unexpired); false when it is not valid. */
export function unlockAccount(token: string): Promise<boolean> {
  return User.sequelize!.transaction(async (transaction) => {
    const [row] = await User.sequelize!.query<{ id: number; user_id: number }>(
      `UPDATE account_unlocks SET used_at = now() WHERE token_hash = $1 AND used_at IS NULL AND expires_at > now() RETURNING id, user_id`,
      { bind: [hashToken(token)], type: QueryTypes.SELECT, transaction },
    );
    if (!row) return false;
    await endLock(row.user_id, transaction);
    return true;
  });
}

/**
 * The account's lock and sign-in back-off end (the unlock link, a password reset): its
 * other unlock links are used up, and the limiter forgets the account.
 */
async function endLock(userId: number, transaction: Transaction): Promise<void> {
  const user = await User.findByPk(userId, { transaction });
  if (!user) return;
  await user.update({ lockedAt: null, failedSignIns: 0 }, { transaction });
  await User.sequelize!.query('UPDATE account_unlocks SET used_at = now() WHERE user_id = $1 AND used_at IS NULL', { bind: [userId], transaction });
  await clearAccountCounters(User.sequelize!, user.email, transaction);
}

/**
 * Queues a reset mail when the address has an enabled account; silent otherwise. The
 * route answers before this runs, so the answer takes as long for any address.
 */
export async function requestPasswordReset(email: string, mailer: Mailer, linkBase: string): Promise<void> {
  const user = await User.findOne({ where: { email } });
  if (!user || user.disabled) return;
  const { token, hash } = newToken();
  await PasswordReset.sequelize!.transaction(async (transaction) => {
    await PasswordReset.create({ userId: user.id, tokenHash: hash, expiresAt: new Date(Date.now() + RESET_MINUTES * 60_000) }, { transaction });
    await mailer.send(passwordResetMail({ to: email, link: `${linkBase}/reset-password/${token}`, minutes: RESET_MINUTES }), { transaction });
  });
}

/**
 * Sets the new password (checked against the policy) and ends every session of the
 * account: whoever knew the old one is out. Every other outstanding reset link of the
 * account stops working, and a lock or sign-in back-off ends (the mailbox was proved).
 */
export async function confirmPasswordReset(token: string, password: string): Promise<void> {
  await PasswordReset.sequelize!.transaction(async (transaction) => {
    const reset = await PasswordReset.findOne({ where: { tokenHash: hashToken(token) }, transaction, lock: transaction.LOCK.UPDATE });
    if (!reset || reset.usedAt || reset.expiresAt.getTime() <= Date.now()) {
      throw new HttpError(400, 'reset_invalid', 'This reset link is not valid any more (used, expired or mistyped). Ask for a new one.');
    }
    const user = await User.findByPk(reset.userId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!user) throw new HttpError(400, 'reset_invalid', 'This reset link is not valid any more (used, expired or mistyped). Ask for a new one.');
    assertPasswordAllowed(password, user.email);
    await PasswordReset.sequelize!.query('UPDATE password_resets SET used_at = now() WHERE user_id = $1 AND used_at IS NULL', { bind: [user.id], transaction });
    await user.update({ passwordHash: await hashPassword(password) }, { transaction });
    await endLock(user.id, transaction);
    await PasswordReset.sequelize!.query(`DELETE FROM session WHERE (sess->'passport'->>'user')::int = $1`, { bind: [user.id], transaction });
  });
}

export const listUsers = () => User.findAll({ order: [['id', 'ASC']] });

/** A disabled account's sessions end: deserializeUser refuses it on the next request. */
export async function setDisabled(id: number, disabled: boolean): Promise<User> {
  const user = await User.findByPk(id);
  if (!user) throw notFound('This account');
  await user.update({ disabled });
  return user;
}

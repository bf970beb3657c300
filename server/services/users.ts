/** Queries of accounts: registration, unlocking, password resets and the admin's list. */
import { QueryTypes } from 'sequelize';
import { RESET_MINUTES } from '../../shared/collaboration.js';
import { hashPassword } from '../auth/password.js';
import { hashToken, newToken } from '../auth/tokens.js';
import type { Mailer } from '../mail/mailer.js';
import { passwordResetMail } from '../mail/templates.js';
import { HttpError, notFound } from '../middleware/http-error.js';
import { PasswordReset, User } from '../models/index.js';

export async function register(o: { email: string; displayName: string; password: string }): Promise<User> {
  if (await User.findOne({ where: { email: o.email } })) {
    throw new HttpError(409, 'email_taken', 'An account with this e-mail address exists already. Sign in instead.');
  }
  return User.create({ email: o.email, displayName: o.displayName, passwordHash: await hashPassword(o.password) });
}

/** Uses an unlock token (single use, unexpired); false when it is not valid. */
export function unlockAccount(token: string): Promise<boolean> {
  return User.sequelize!.transaction(async (transaction) => {
    const [row] = await User.sequelize!.query<{ id: number; user_id: number }>(
      `UPDATE account_unlocks SET used_at = now() WHERE token_hash = $1 AND used_at IS NULL AND expires_at > now() RETURNING id, user_id`,
      { bind: [hashToken(token)], type: QueryTypes.SELECT, transaction },
    );
    if (!row) return false;
    await User.update({ lockedAt: null, failedSignIns: 0 }, { where: { id: row.user_id }, transaction });
    return true;
  });
}

/** Queues a reset mail when the address has an enabled account; silent otherwise. */
export async function requestPasswordReset(email: string, mailer: Mailer, linkBase: string): Promise<void> {
  const user = await User.findOne({ where: { email } });
  if (!user || user.disabled) return;
  const { token, hash } = newToken();
  await PasswordReset.sequelize!.transaction(async (transaction) => {
    await PasswordReset.create({ userId: user.id, tokenHash: hash, expiresAt: new Date(Date.now() + RESET_MINUTES * 60_000) }, { transaction });
    await mailer.send(passwordResetMail({ to: email, link: `${linkBase}/reset-password/${token}`, minutes: RESET_MINUTES }), { transaction });
  });
}

/** Sets the new password and ends every session of the account: whoever knew the old one is out. */
export async function confirmPasswordReset(token: string, password: string): Promise<void> {
  await PasswordReset.sequelize!.transaction(async (transaction) => {
    const reset = await PasswordReset.findOne({ where: { tokenHash: hashToken(token) }, transaction, lock: transaction.LOCK.UPDATE });
    if (!reset || reset.usedAt || reset.expiresAt.getTime() <= Date.now()) {
      throw new HttpError(400, 'reset_invalid', 'This reset link is not valid any more (used, expired or mistyped). Ask for a new one.');
    }
    await reset.update({ usedAt: new Date() }, { transaction });
    await User.update({ passwordHash: await hashPassword(password) }, { where: { id: reset.userId }, transaction });
    await PasswordReset.sequelize!.query(`DELETE FROM session WHERE (sess->'passport'->>'user')::int = $1`, { bind: [reset.userId], transaction });
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

/**
 * Checking a password for sign-in, the one way in (the sign-in form and accepting an
 * invitation with an existing account's password both come here), with the back-off of
 * throttle.ts, the unlock mail, and the upgrade of old password hashes.
 */
import { LIMITS } from '../../shared/api.js';
import type { Mailer } from '../mail/mailer.js';
import { unlockMail } from '../mail/templates.js';
import { HttpError } from '../middleware/http-error.js';
import { User } from '../models/index.js';
import { DUMMY_HASH, checkPassword, hashPassword, needsRehash } from './password.js';
import { SignInThrottle, clientKey, normaliseEmail, waitSeconds, type ThrottleLimits } from './throttle.js';
import { newToken } from './tokens.js';

export const WRONG_CREDENTIALS = 'The e-mail address or the password is wrong. Check both and try again.';

/** "3 minutes", "1 minute", "20 seconds". */
export function waitWords(seconds: number): string {
  if (seconds >= 90) {
    const m = Math.ceil(seconds / 60);
    return `${m} minutes`;
  }
  const s = Math.max(1, Math.ceil(seconds));
  return s === 1 ? '1 second' : `${s} seconds`;
}

export const tooManyAttempts = (seconds: number) =>
  new HttpError(429, 'rate_limited', `Too many sign-in attempts from here. Wait ${waitWords(seconds)} and try again.`, { retryAfter: seconds });

const locked = (seconds: number) =>
  new HttpError(
    401,
    'account_locked',
    `This account is locked after ${LIMITS.failedSignInsBeforeLock} failed sign-ins in a row. We sent an unlock link to its e-mail address. ` +
      `You can also sign in from a device you used before, or try again in ${waitWords(seconds)}.`,
    { retryAfter: seconds },
  );

export class SignInService {
  readonly throttle: SignInThrottle;

  constructor(
    private readonly mailer: Mailer,
    private readonly publicUrl: () => string,
    limits: ThrottleLimits,
  ) {
    this.throttle = new SignInThrottle(User.sequelize!, limits);
  }

  /**
   * The account for an address and password, or an HttpError: 401 (wrong, locked for this
   * client address, disabled) or 429 (back-off; `retryAfter` seconds in the error's extra).
   */
  async authenticate(emailInput: string, password: string, ip: string | undefined): Promise<User> {
    const email = normaliseEmail(emailInput);
    const address = clientKey(ip);
    const user = await User.findOne({ where: { email } });
    const familiar = user ? await this.throttle.isFamiliar(user.id, address) : false;
    const reservation = await this.throttle.reserve(email, address, familiar);
    if (!reservation.ok) throw reservation.reason === 'throttled' ? tooManyAttempts(reservation.retryAfter) : locked(reservation.retryAfter);
    const ok = await checkPassword(password, user?.passwordHash ?? DUMMY_HASH);
    if (!user || !ok) {
      const lockAt = this.throttle.limits.accountFree;
      if (user && reservation.accountFailures === lockAt) await this.lock(user);
      if (reservation.accountFailures >= lockAt && !familiar) throw locked(waitSeconds('account', reservation.accountFailures, lockAt));
      throw new HttpError(401, 'bad_credentials', WRONG_CREDENTIALS);
    }
    const counterEnded = await this.throttle.succeeded(email, address);
    if (user.disabled) throw new HttpError(401, 'account_disabled', 'This account is disabled. Ask the site admin to enable it.');
    await this.throttle.remember(user.id, address);
    const changes: Partial<{ lockedAt: Date | null; failedSignIns: number; passwordHash: string }> = {};
    if (user.lockedAt && counterEnded) changes.lockedAt = null;
    if (user.failedSignIns) changes.failedSignIns = 0;
    // An old-format hash is replaced now that the password is known (no 72-byte cut from here on).
    if (needsRehash(user.passwordHash)) changes.passwordHash = await hashPassword(password);
    if (Object.keys(changes).length) await user.update(changes);
    return user;
  }

  /** A new account or one that just proved its mailbox: its client address counts as known. */
  async remember(user: User, ip: string | undefined): Promise<void> {
    await this.throttle.remember(user.id, clientKey(ip));
  }

  /** The failure that reaches the limit marks the account and mails an unlock link. */
  private async lock(user: User): Promise<void> {
    const { token, hash } = newToken();
    await User.sequelize!.transaction(async (transaction) => {
      await User.update({ lockedAt: new Date() }, { where: { id: user.id }, transaction });
      await User.sequelize!.query(`INSERT INTO account_unlocks (user_id, token_hash, expires_at) VALUES ($1, $2, now() + interval '7 days')`, {
        bind: [user.id, hash],
        transaction,
      });
      await this.mailer.send(
        unlockMail({ to: user.email, link: `${this.publicUrl()}/unlock/${token}`, failures: LIMITS.failedSignInsBeforeLock }),
        { transaction },
      );
    });
  }
}

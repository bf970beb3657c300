import passport from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import { QueryTypes } from 'sequelize';
import { LIMITS } from '../../shared/api.js';
import type { Mailer } from '../mail/mailer.js';
import { unlockMail } from '../mail/templates.js';
import { User } from '../models/index.js';
import { checkPassword } from './password.js';
import { newToken } from './tokens.js';

// A fixed hash to compare against when the address is unknown, so that the answer
// takes as long for unknown addresses as for wrong passwords.
const DUMMY_HASH = '$2b$10$CwTycUXWue0Thq9StjUM0uJ8.PRKE1pyQmyrp3fEzJvO0yNNnBfyK';
const WRONG = 'The e-mail address or the password is wrong. Check both and try again.';
const LOCKED = `This account is locked after ${LIMITS.failedSignInsBeforeLock} failed sign-ins in a row. We sent an unlock link to its e-mail address.`;

/** Counts a failure; the one that reaches the limit locks the account and mails an unlock link. */
async function recordFailure(user: User, mailer: Mailer, publicUrl: () => string): Promise<boolean> {
  const [row] = await User.sequelize!.query<{ failed_sign_ins: number }>(
    'UPDATE users SET failed_sign_ins = failed_sign_ins + 1 WHERE id = $1 RETURNING failed_sign_ins',
    { bind: [user.id], type: QueryTypes.SELECT },
  );
  if (row.failed_sign_ins !== LIMITS.failedSignInsBeforeLock) return row.failed_sign_ins > LIMITS.failedSignInsBeforeLock;
  const { token, hash } = newToken();
  await User.sequelize!.transaction(async (transaction) => {
    await User.update({ lockedAt: new Date() }, { where: { id: user.id }, transaction });
    await User.sequelize!.query(`INSERT INTO account_unlocks (user_id, token_hash, expires_at) VALUES ($1, $2, now() + interval '7 days')`, {
      bind: [user.id, hash],
      transaction,
    });
    await mailer.send(unlockMail({ to: user.email, link: `${publicUrl()}/unlock/${token}`, failures: LIMITS.failedSignInsBeforeLock }), { transaction });
  });
  return true;
}

export function configurePassport(mailer: Mailer, publicUrl: () => string): passport.PassportStatic {
  passport.use(
    new LocalStrategy({ usernameField: 'email', passwordField: 'password' }, async (email, password, done) => {
      try {
        const user = await User.findOne({ where: { email: email.trim().toLowerCase() } });
        const ok = await checkPassword(password, user?.passwordHash ?? DUMMY_HASH);
        if (!user) return done(null, false, { message: WRONG });
        if (user.lockedAt) return done(null, false, { message: LOCKED });
        if (!ok) return done(null, false, { message: (await recordFailure(user, mailer, publicUrl)) ? LOCKED : WRONG });
        if (user.disabled) return done(null, false, { message: 'This account is disabled. Ask the site admin to enable it.' });
        if (user.failedSignIns) await user.update({ failedSignIns: 0 });
        return done(null, user);
      } catch (err) {
        return done(err);
      }
    }),
  );
  passport.serializeUser((user, done) => done(null, (user as User).id));
  passport.deserializeUser(async (id: number, done) => {
    try {
      const user = await User.findByPk(id);
      // A disabled account loses its sessions at the next request.
      done(null, user && !user.disabled ? user : false);
    } catch (err) {
      done(err);
    }
  });
  return passport;
}

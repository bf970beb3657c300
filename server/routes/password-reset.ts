import { Router } from 'express';
import { rateLimit } from 'express-rate-limit';
import { RESET_MINUTES, resetConfirmBody, resetRequestBody } from '../../shared/collaboration.js';
import { hashPassword } from '../auth/password.js';
import { hashToken, newToken } from '../auth/tokens.js';
import type { ServerConfig } from '../config.js';
import type { Mailer } from '../mail/mailer.js';
import { passwordResetMail } from '../mail/templates.js';
import { HttpError } from '../middleware/http-error.js';
import { parseInput } from '../middleware/validate.js';
import { PasswordReset, User } from '../models/index.js';

/** Routes under /api/auth/password-reset. */
export function passwordResetRoutes(config: ServerConfig, mailer: Mailer): Router {
  const router = Router();
  const limiter = rateLimit({
    windowMs: 15 * 60_000,
    limit: 10,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    message: { error: { code: 'rate_limited', message: 'Too many reset requests. Wait 15 minutes and try again.' } },
  });

  // The same answer whether or not the address has an account: no hint either way.
  router.post('/', limiter, async (req, res) => {
    const { email } = parseInput(resetRequestBody, req.body);
    const user = await User.findOne({ where: { email } });
    if (user && !user.disabled) {
      const { token, hash } = newToken();
      await PasswordReset.sequelize!.transaction(async (transaction) => {
        await PasswordReset.create({ userId: user.id, tokenHash: hash, expiresAt: new Date(Date.now() + RESET_MINUTES * 60_000) }, { transaction });
        await mailer.send(passwordResetMail({ to: email, link: `${config.publicUrl}/reset-password/${token}`, minutes: RESET_MINUTES }), { transaction });
      });
    }
    res.status(202).json({ message: `If an account has this address, a link to choose a new password is on its way. It works once, for ${RESET_MINUTES} minutes.` });
  });

  router.post('/confirm', limiter, async (req, res) => {
    const body = parseInput(resetConfirmBody, req.body);
    await PasswordReset.sequelize!.transaction(async (transaction) => {
      const reset = await PasswordReset.findOne({ where: { tokenHash: hashToken(body.token) }, transaction, lock: transaction.LOCK.UPDATE });
      if (!reset || reset.usedAt || reset.expiresAt.getTime() <= Date.now()) {
        throw new HttpError(400, 'reset_invalid', 'This reset link is not valid any more (used, expired or mistyped). Ask for a new one.');
      }
      await reset.update({ usedAt: new Date() }, { transaction });
      await User.update({ passwordHash: await hashPassword(body.password) }, { where: { id: reset.userId }, transaction });
      // Every session of the account ends: whoever knew the old password is out.
      await PasswordReset.sequelize!.query(`DELETE FROM session WHERE (sess->'passport'->>'user')::int = $1`, { bind: [reset.userId], transaction });
    });
    res.status(204).end();
  });

  return router;
}

import { Router } from 'express';
import { sharedRateLimit } from '../middleware/shared-rate-limit.js';
import { RESET_MINUTES, resetConfirmBody, resetRequestBody } from '../../shared/collaboration.js';
import type { ServerConfig } from '../config.js';
import type { Logger } from '../logger.js';
import type { Mailer } from '../mail/mailer.js';
import { parseInput } from '../middleware/validate.js';
import { confirmPasswordReset, requestPasswordReset } from '../services/users.js';

/** Routes under /api/auth/password-reset. */
export function passwordResetRoutes(config: ServerConfig, mailer: Mailer, logger: Logger): Router {
  const router = Router();
  const limiter = sharedRateLimit('password-reset', 15 * 60_000, 10, 'Too many reset requests. Wait 15 minutes and try again.');

  // The same answer whether or not the address has an account, and in the same time: it
  // is sent before the account is even looked up; the link is made and queued afterwards.
  router.post('/', limiter, (req, res) => {
    const { email } = parseInput(resetRequestBody, req.body);
    res.once('close', () => {
      requestPasswordReset(email, mailer, config.publicUrl).catch((err) => logger.warn({ err: err?.message }, 'password reset request failed'));
    });
    res.status(202).json({ message: `If an account has this address, a link to choose a new password is on its way. It works once, for ${RESET_MINUTES} minutes.` });
  });

  router.post('/confirm', limiter, async (req, res) => {
    const body = parseInput(resetConfirmBody, req.body);
    await confirmPasswordReset(body.token, body.password);
    res.status(204).end();
  });

  return router;
}

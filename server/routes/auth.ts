import { Router, type Request, type Response } from 'express';
import { sharedRateLimit } from '../middleware/shared-rate-limit.js';
import { z } from 'zod';
import { loginBody, registerBody } from '../../shared/api.js';
import { currentUser, requireUser } from '../middleware/auth.js';
import { HttpError } from '../middleware/http-error.js';
import { parseInput } from '../middleware/validate.js';
import type { User } from '../models/index.js';
import { register, unlockAccount } from '../services/users.js';
import type { SignInService } from '../auth/sign-in.js';
import { issueCsrfToken } from '../middleware/csrf.js';

const unlockBody = z.object({ token: z.string().min(10).max(200) });

function signIn(req: Request, res: Response, user: User): Promise<void> {
  // passport regenerates the session here (a new id at sign-in: no session fixation).
  return new Promise((resolve, reject) =>
    req.login(user, (err) => {
      if (err) return reject(err);
      issueCsrfToken(req, res);
      resolve();
    }),
  );
}

export function authRoutes(options: { loginRateLimit: number; signIn: SignInService }): Router {
  const router = Router();
  const registerLimiter = sharedRateLimit('register', 60 * 60_000, options.loginRateLimit, 'Too many registrations from this address in the last hour. Wait a while and try again.');

  router.post('/register', registerLimiter, async (req, res) => {
    const body = parseInput(registerBody, req.body);
    const user = await register(body);
    await options.signIn.remember(user, req.ip);
    await signIn(req, res, user);
    res.status(201).json({ user: user.toDto() });
  });

  // Sign-in back-off (per account and client address, per client address, per account)
  // is in the database: see server/auth/throttle.ts.
  router.post('/login', async (req, res) => {
    const body = parseInput(loginBody, req.body);
    const user = await options.signIn.authenticate(body.email, body.password, req.ip).catch((err) => {
      if (typeof err?.extra?.retryAfter === 'number') res.set('Retry-After', String(err.extra.retryAfter));
      throw err;
    });
    await signIn(req, res, user);
    res.json({ user: user.toDto() });
  });

  // The link from the lockout mail: single use, 7 days.
  router.post('/unlock', async (req, res) => {
    const { token } = parseInput(unlockBody, req.body);
    const unlocked = await unlockAccount(token);
    if (!unlocked) throw new HttpError(400, 'unlock_invalid', 'This unlock link is not valid any more (used, expired or mistyped). Try to sign in to get a new one.');
    res.json({ message: 'The account is unlocked. Sign in with your password.' });
  });

  router.post('/logout', async (req, res) => {
    await new Promise<void>((resolve, reject) => req.logout((err) => (err ? reject(err) : resolve())));
    issueCsrfToken(req, res);
    res.status(204).end();
  });

  router.get('/me', requireUser, (req, res) => {
    res.json({ user: currentUser(req).toDto() });
  });

  return router;
}

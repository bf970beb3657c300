import type { RequestHandler } from 'express';
import { HttpError } from './http-error.js';
import type { User } from '../models/index.js';

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    // passport puts the signed-in account here.
    // eslint-disable-next-line @typescript-eslint/no-empty-object-type
    interface User extends InstanceType<typeof import('../models/user.js').User> {}
  }
}

export const requireUser: RequestHandler = (req, _res, next) => {
  if (!req.user) return next(new HttpError(401, 'not_signed_in', 'Sign in to continue.'));
  next();
};

export const requireAdmin: RequestHandler = (req, _res, next) => {
  if (!req.user) return next(new HttpError(401, 'not_signed_in', 'Sign in to continue.'));
  if (req.user.siteRole !== 'admin') return next(new HttpError(403, 'forbidden', 'Only a site admin can do this.'));
  next();
};

export function currentUser(req: Express.Request): User {
  if (!req.user) throw new HttpError(401, 'not_signed_in', 'Sign in to continue.');
  return req.user as User;
}

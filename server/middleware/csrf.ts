import { randomBytes, timingSafeEqual } from 'node:crypto';
import type { Request, RequestHandler, Response } from 'express';
import { HttpError } from './http-error.js';

const COOKIE = 'XSRF-TOKEN';
const HEADER = 'x-xsrf-token';
const SAFE = new Set(['GET', 'HEAD', 'OPTIONS']);

/**
 * Cross-site request forgery protection by Angular's convention: the server keeps a
 * random token in the session and mirrors it in a readable XSRF-TOKEN cookie;
 * HttpClient sends it back in X-XSRF-TOKEN on every state-changing request, which
 * a page of another site cannot do.
 */
export function csrfProtection(secureCookies: boolean): RequestHandler {
  return (req, res, next) => {
    res.locals['secureCookies'] = secureCookies;
    const session = req.session as typeof req.session & { csrfToken?: string };
    if (!session.csrfToken) session.csrfToken = randomBytes(24).toString('base64url');
    if (req.cookies?.[COOKIE] !== session.csrfToken) setCookie(res, session.csrfToken);
    if (SAFE.has(req.method)) return next();
    const sent = req.get(HEADER) ?? '';
    const expected = session.csrfToken;
    const ok = sent.length === expected.length && timingSafeEqual(Buffer.from(sent), Buffer.from(expected));
    if (!ok) {
      return next(
        new HttpError(403, 'csrf_failed', 'This request lacks a valid XSRF-TOKEN header. Reload the page and try again.'),
      );
    }
    next();
  };
}

function setCookie(res: Response, token: string) {
  res.cookie(COOKIE, token, { sameSite: 'strict', secure: res.locals['secureCookies'] === true, httpOnly: false, path: '/' });
}

/** A fresh token after sign-in and sign-out, whose session regeneration drops the old one. */
export function issueCsrfToken(req: Request, res: Response): void {
  const session = req.session as typeof req.session & { csrfToken?: string };
  session.csrfToken = randomBytes(24).toString('base64url');
  setCookie(res, session.csrfToken);
}

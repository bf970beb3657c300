import { createHmac, randomBytes, timingSafeEqual } from 'node:crypto';
import type { Request, RequestHandler, Response } from 'express';
import { HttpError } from './http-error.js';

const COOKIE = 'XSRF-TOKEN';
const HEADER = 'x-xsrf-token';
const SAFE = new Set(['GET', 'HEAD', 'OPTIONS']);

/**
 * Cross-site request forgery protection by Angular's convention, without storing
 * anything: a signed double-submit cookie. The readable XSRF-TOKEN cookie holds
 * `nonce.mac`, the mac an HMAC (with the session secret) of the nonce and of what the
 * token is for: the session id when signed in, "anon" when signed out. HttpClient sends
 * it back in X-XSRF-TOKEN on every state-changing request, which a page of another site
 * cannot do; a cookie planted by someone else does not carry a valid mac, and a signed-in
 * token does not work for another session. Signed-out visitors therefore get a working
 * token without a session row (a session is stored only at sign-in).
 */
export function csrfProtection(secret: string, secureCookies: boolean): RequestHandler {
  return (req, res, next) => {
    res.locals['secureCookies'] = secureCookies;
    res.locals['csrfSecret'] = secret;
    const cookie = String(req.cookies?.[COOKIE] ?? '');
    const valid = verify(secret, cookie, bindingOf(req));
    if (!valid) setCookie(res, mint(secret, bindingOf(req)));
    if (SAFE.has(req.method)) return next();
    const sent = req.get(HEADER) ?? '';
    const ok = (valid && same(sent, cookie)) || legacySessionToken(req, sent);
    if (!ok) {
      return next(
        new HttpError(403, 'csrf_failed', 'This request lacks a valid XSRF-TOKEN header. Reload the page and try again.'),
      );
    }
    next();
  };
}

/** What a token is bound to: the session when someone is signed in, else nothing stored. */
function bindingOf(req: Request): string {
  return req.user ? `s:${req.sessionID}` : 'anon';
}

const mac = (secret: string, nonce: string, binding: string) =>
  createHmac('sha256', secret).update(`${nonce}.${binding}`).digest('base64url');

function mint(secret: string, binding: string): string {
  const nonce = randomBytes(18).toString('base64url');
  return `${nonce}.${mac(secret, nonce, binding)}`;
}

function verify(secret: string, token: string, binding: string): boolean {
  const dot = token.indexOf('.');
  if (dot < 1 || token.length > 200) return false;
  return same(token.slice(dot + 1), mac(secret, token.slice(0, dot), binding));
}

function same(a: string, b: string): boolean {
  return a.length > 0 && a.length === b.length && timingSafeEqual(Buffer.from(a), Buffer.from(b));
}

/** Sessions stored before signed tokens kept their token in the session; it still works for them. */
function legacySessionToken(req: Request, sent: string): boolean {
  const stored = (req.session as (typeof req.session & { csrfToken?: string }) | undefined)?.csrfToken;
  return typeof stored === 'string' && same(sent, stored);
}

function setCookie(res: Response, token: string) {
  res.cookie(COOKIE, token, { sameSite: 'strict', secure: res.locals['secureCookies'] === true, httpOnly: false, path: '/' });
}

/** A fresh token after sign-in and sign-out, whose session regeneration changes what it is bound to. */
export function issueCsrfToken(req: Request, res: Response): void {
  setCookie(res, mint(String(res.locals['csrfSecret']), bindingOf(req)));
}

import passport from 'passport';
import { User } from '../models/index.js';
import { prefetchedAccount } from './session-store.js';

/**
 * Passport keeps the signed-in account in the session (its id) and loads it per request.
 * Passwords are checked by SignInService (sign-in.ts), which applies the back-off.
 */
export function configurePassport(): passport.PassportStatic {
  passport.serializeUser((user, done) => done(null, (user as User).id));
  passport.deserializeUser(async (id: number, done) => {
    try {
      // read with the session when possible (session-store.ts), else by id
      const row = prefetchedAccount(id);
      const user = row ? User.build(row, { isNewRecord: false, raw: true }) : await User.findByPk(id);
      // A disabled account loses its sessions at the next request.
      done(null, user && !user.disabled ? user : false);
    } catch (err) {
      done(err);
    }
  });
  return passport;
}

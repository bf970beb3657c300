import passport from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import { User } from '../models/index.js';
import { checkPassword } from './password.js';

// A fixed hash to compare against when the address is unknown, so that the answer
// takes as long for unknown addresses as for wrong passwords.
const DUMMY_HASH = '$2b$10$CwTycUXWue0Thq9StjUM0uJ8.PRKE1pyQmyrp3fEzJvO0yNNnBfyK';

export function configurePassport(): passport.PassportStatic {
  passport.use(
    new LocalStrategy({ usernameField: 'email', passwordField: 'password' }, async (email, password, done) => {
      try {
        const user = await User.findOne({ where: { email: email.trim().toLowerCase() } });
        const ok = await checkPassword(password, user?.passwordHash ?? DUMMY_HASH);
        if (!user || !ok) return done(null, false, { message: 'The e-mail address or the password is wrong. Check both and try again.' });
        if (user.disabled) return done(null, false, { message: 'This account is disabled. Ask the site admin to enable it.' });
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

import passport, { type PassportStatic } from 'passport';
import { User } from './user.model';

/** Passport keeps only the user id in the session and loads the account on each request. */
export function configurePassport(): PassportStatic {
  passport.serializeUser((user, done) => done(null, user.id));
  passport.deserializeUser((id: string, done) => {
    User.findByPk(id).then(
      (user) => done(null, user ? user.toDto() : false),
      (err) => done(err),
    );
  });
  return passport;
}

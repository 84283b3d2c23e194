import type { Request } from 'express';
import { Passport, type PassportStatic } from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import { AppError } from '../../core/app-error';
import type { AuthService } from './auth.service';
import { accountKey, addressKey, THROTTLE, type SignInThrottle } from './sign-in-throttle';
import { User } from './user.model';

/** The same answer for an unknown e-mail and a wrong password (ASVS 5.0 6.3.8). */
export const BAD_CREDENTIALS = 'The e-mail or password is not right.';

const tooMany = (retryAfterSeconds: number) =>
  new AppError(429, 'too_many_attempts', `Too many failed sign-ins. Wait ${retryAfterSeconds} s and try again, or reset the password.`, {
    retryAfterSeconds,
  });

/**
 * Sign-in through passport-local. The verify callback is where the back-off lives: the attempt is
 * reserved on the client address, then on the account, before the password is checked; a right
 * password gives both back. Unknown accounts cost the same argon2 work as known ones.
 */
export function configurePassport(auth: AuthService, throttle: SignInThrottle): PassportStatic {
  // One instance per app, so two apps in one process (tests, a restart drill) do not share strategies.
  const passport = new Passport() as PassportStatic;
  // The session keeps the account's public fields, so a request needs no users query. Whatever
  // changes them signs in again (verification) or ends the sessions (password reset and change).
  passport.serializeUser((user, done) =>
    done(null, { id: user.id, email: user.email, displayName: user.displayName, emailVerified: user.emailVerified }),
  );
  passport.deserializeUser((stored: Express.User | string, done) => {
    if (typeof stored === 'object' && stored?.id) return done(null, stored);
    // Sessions from before the fields were kept hold the id alone.
    User.findByPk(String(stored)).then(
      (user) => done(null, user ? user.toDto() : false),
      (err) => done(err),
    );
  });
  const verify = async (req: Request, email: string, password: string): Promise<Express.User | false> => {
    const address = addressKey(req.ip ?? 'unknown');
    const account = accountKey(email);
    const byAddress = await throttle.reserve(address, THROTTLE.address);
    if (byAddress) throw tooMany(byAddress.retryAfterSeconds);
    // A guess refused by the account's back-off still counts against the address that made it.
    const byAccount = await throttle.reserve(account, THROTTLE.account);
    if (byAccount) throw tooMany(byAccount.retryAfterSeconds);
    const user = await auth.checkCredentials(email, password);
    if (!user) return false;
    await Promise.all([throttle.clear(account), throttle.giveBack(address)]);
    return user.toDto();
  };
  passport.use(
    new LocalStrategy(
      { usernameField: 'email', passwordField: 'password', passReqToCallback: true, session: false },
      (req, email, password, done) => {
        verify(req, email, password).then(
          (user) => done(null, user, user ? undefined : { message: BAD_CREDENTIALS }),
          (err) => done(err),
        );
      },
    ),
  );
  return passport;
}

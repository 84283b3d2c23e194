import type { Request } from 'express';
import { RateLimiterPostgres, RateLimiterRes } from 'rate-limiter-flexible';
import type { Sequelize } from 'sequelize';
import { passwordResetConfirmSchema, passwordResetSchema, signInSchema, signUpSchema } from '../../../shared/api/auth.schema';
import { ApiRouter } from '../../core/api-router';
import { AppError } from '../../core/app-error';
import { publicAccess } from '../../core/policy';
import { issueCsrfCookie } from '../../core/session';
import type { AuthService } from './auth.service';
import type { User } from './user.model';

/** At most 100 failed sign-ins per account per hour (ASVS 4 2.2.1); counted in PostgreSQL. */
export const MAX_FAILED_SIGN_INS = 100;

function logIn(req: Request, user: User): Promise<void> {
  // passport ≥ 0.6 regenerates the session id in req.login (ASVS 5.0 7.2.4).
  return new Promise((resolve, reject) =>
    req.login(user.toDto(), (err) => {
      if (err) return reject(err);
      req.session.signedInAt = Date.now();
      resolve();
    }),
  );
}

export function authRoutes(auth: AuthService, sequelize: Sequelize): ApiRouter {
  const limiter = new RateLimiterPostgres({
    storeClient: sequelize,
    storeType: 'sequelize',
    tableName: 'sign_in_limits',
    tableCreated: true,
    keyPrefix: 'sign-in',
    points: MAX_FAILED_SIGN_INS,
    duration: 60 * 60,
  });
  const api = new ApiRouter('/auth', 'Accounts');

  api.route('post', '/sign-up', { policy: publicAccess, summary: 'Create an account and sign in', body: signUpSchema, status: 201 }, async (req, res) => {
    const user = await auth.signUp(req.body);
    await logIn(req, user);
    issueCsrfCookie(req, res, true);
    res.status(201).json({ user: user.toDto() });
  });

  api.route('post', '/sign-in', { policy: publicAccess, summary: 'Sign in with e-mail and password', body: signInSchema }, async (req, res) => {
    const key = req.body.email as string;
    const used = await limiter.get(key);
    if (used && used.consumedPoints >= MAX_FAILED_SIGN_INS) {
      res.set('Retry-After', String(Math.ceil(used.msBeforeNext / 1000)));
      throw new AppError(429, 'too_many_attempts', 'Too many failed sign-ins for this account. Wait an hour or reset the password.');
    }
    const user = await auth.checkCredentials(req.body.email, req.body.password);
    if (!user) {
      await limiter.consume(key).catch((e) => {
        if (!(e instanceof RateLimiterRes)) throw e;
      });
      // The same answer for an unknown e-mail and a wrong password (ASVS 5.0 6.3.8).
      throw new AppError(401, 'bad_credentials', 'The e-mail or password is not right.');
    }
    await logIn(req, user);
    issueCsrfCookie(req, res, true);
    res.json({ user: user.toDto() });
  });

  api.route('post', '/sign-out', { policy: publicAccess, summary: 'Sign out and end the session' }, async (req, res) => {
    await new Promise<void>((resolve, reject) => req.logout((err) => (err ? reject(err) : resolve())));
    await new Promise<void>((resolve, reject) => req.session.destroy((err) => (err ? reject(err) : resolve())));
    res.clearCookie('emberline.sid', { path: '/' });
    res.status(204).end();
  });

  api.route('get', '/me', { policy: publicAccess, summary: 'The signed-in user, or null when signed out' }, (req, res) => {
    res.json({ user: req.user ?? null });
  });

  api.route('post', '/password-reset', { policy: publicAccess, summary: 'E-mail a password reset link', body: passwordResetSchema, status: 202 }, async (req, res) => {
    await auth.requestReset(req.body.email);
    res.status(202).json({ message: 'If an account uses this e-mail, a reset link is on its way.' });
  });

  api.route('post', '/password-reset/confirm', { policy: publicAccess, summary: 'Set a new password with a reset token', body: passwordResetConfirmSchema }, async (req, res) => {
    await auth.confirmReset(req.body.token, req.body.password);
    res.json({ message: 'Password changed. Sign in with the new password.' });
  });

  return api;
}

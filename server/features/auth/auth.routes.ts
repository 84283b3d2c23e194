import type { NextFunction, Request, Response } from 'express';
import type { PassportStatic } from 'passport';
import {
  changePasswordSchema,
  updateProfileSchema,
  passwordResetConfirmSchema,
  passwordResetSchema,
  signInSchema,
  signUpSchema,
  verifyEmailSchema,
} from '@shared/api/auth.schema';
import { ApiRouter } from '../../core/api-router';
import { AppError } from '../../core/app-error';
import { publicAccess, signedIn } from '../../core/policy';
import { issueCsrfCookie } from '../../core/session';
import { SIGN_UP_SENT, type AuthService } from './auth.service';
import { BAD_CREDENTIALS } from './passport';

function logIn(req: Request, user: Express.User): Promise<void> {
  // passport ≥ 0.6 regenerates the session id in req.login (ASVS 5.0 7.2.4).
  return new Promise((resolve, reject) =>
    req.login(user, (err) => {
      if (err) return reject(err);
      req.session.signedInAt = Date.now();
      resolve();
    }),
  );
}

/** Runs passport-local and resolves with the user, or throws 401 / 429. */
function authenticate(passport: PassportStatic, req: Request, res: Response): Promise<Express.User> {
  return new Promise((resolve, reject) => {
    const next: NextFunction = (err?: unknown) => reject(err);
    passport.authenticate('local', { session: false }, (err: unknown, user: Express.User | false) => {
      if (err) return reject(err);
      if (!user) return reject(new AppError(401, 'bad_credentials', BAD_CREDENTIALS));
      resolve(user);
    })(req, res, next);
  });
}

/** /api/auth: sign-up with a mailed link, sign-in, sign-out, password reset and change. */
export function authRoutes(auth: AuthService, passport: PassportStatic): ApiRouter {
  const api = new ApiRouter('/auth', 'Accounts');
  api.route(
    'get',
    '/csrf',
    {
      policy: publicAccess,
      summary: 'Start a session with a CSRF token (the XSRF-TOKEN cookie and the body), needed before the first mutation',
    },
    (req, res) => {
      issueCsrfCookie(req, res);
      res.json({ token: res.locals.csrfToken });
    },
  );
  api.route(
    'post',
    '/sign-up',
    {
      policy: publicAccess,
      summary: 'Start a sign-up: mails a link that creates the account (or, with a matching invite token, creates it at once)',
      body: signUpSchema,
      status: 202,
    },
    async (req, res) => {
      const user = await auth.signUp(req.body);
      if (!user) {
        res.status(202).json({ message: SIGN_UP_SENT });
        return;
      }
      await logIn(req, user.toDto());
      issueCsrfCookie(req, res, true);
      res.status(201).json({ user: user.toDto() });
    },
  );
  api.route(
    'post',
    '/verify-email',
    {
      policy: publicAccess,
      summary: 'Open a mailed verification link: creates (or confirms) the account and signs it in',
      body: verifyEmailSchema,
    },
    async (req, res) => {
      const user = await auth.verifyEmail(req.body.token);
      await logIn(req, user.toDto());
      issueCsrfCookie(req, res, true);
      res.json({ user: user.toDto() });
    },
  );
  api.route(
    'post',
    '/verify-email/resend',
    { policy: signedIn, summary: 'Mail a new verification link to the signed-in account', status: 202 },
    async (req, res) => {
      await auth.resendVerification(req.user.id);
      res.status(202).json({ message: 'If this address still needs confirming, a link is on its way.' });
    },
  );
  api.route(
    'post',
    '/sign-in',
    { policy: publicAccess, summary: 'Sign in with e-mail and password (back-off per account and per address)', body: signInSchema },
    async (req, res) => {
      const user = await authenticate(passport, req, res);
      await logIn(req, user);
      issueCsrfCookie(req, res, true);
      res.json({ user });
    },
  );
  api.route('post', '/sign-out', { policy: publicAccess, summary: 'Sign out and end the session' }, async (req, res) => {
    await new Promise<void>((resolve, reject) => req.logout((err) => (err ? reject(err) : resolve())));
    await new Promise<void>((resolve, reject) => req.session.destroy((err) => (err ? reject(err) : resolve())));
    res.clearCookie('emberline.sid', { path: '/' });
    res.clearCookie('XSRF-TOKEN', { path: '/' });
    res.status(204).end();
  });
  api.route('get', '/me', { policy: publicAccess, summary: 'The signed-in user, or null when signed out' }, (req, res) => {
    res.json({ user: req.user ?? null });
  });
  api.route(
    'patch',
    '/me',
    { policy: signedIn, summary: "Change the signed-in account's display name", body: updateProfileSchema },
    async (req, res) => {
      const user = await auth.rename(req.user.id, req.body.displayName);
      // The session keeps the account's public fields: keep them current for this session.
      const stored = (req.session as unknown as { passport?: { user?: Express.User } }).passport;
      if (stored?.user && typeof stored.user === 'object') stored.user = { ...stored.user, displayName: user.displayName };
      req.user = { ...req.user, displayName: user.displayName };
      res.json({ user: req.user });
    },
  );
  api.route(
    'post',
    '/password',
    { policy: signedIn, summary: "Change the signed-in account's password; ends its other sessions", body: changePasswordSchema },
    async (req, res) => {
      await auth.changePassword(req.user.id, req.body.currentPassword, req.body.newPassword, req.sessionID);
      res.json({ message: 'Password changed. Your other sessions are signed out.' });
    },
  );
  api.route(
    'post',
    '/password-reset',
    { policy: publicAccess, summary: 'E-mail a password reset link', body: passwordResetSchema, status: 202 },
    async (req, res) => {
      await auth.requestReset(req.body.email);
      res.status(202).json({ message: 'If an account uses this e-mail, a reset link is on its way.' });
    },
  );
  api.route(
    'get',
    '/password-reset/:token',
    { policy: publicAccess, summary: 'Whether a mailed reset link still works' },
    async (req, res) => {
      res.set('Referrer-Policy', 'no-referrer');
      if (!(await auth.resetLinkWorks(String(req.params.token)))) {
        throw new AppError(
          410,
          'reset_link_invalid',
          'This reset link was already used, replaced by a newer one or has expired. Ask for a new one.',
        );
      }
      res.json({ valid: true });
    },
  );
  api.route(
    'post',
    '/password-reset/confirm',
    {
      policy: publicAccess,
      summary: 'Set a new password with a reset token; ends every session of the account',
      body: passwordResetConfirmSchema,
    },
    async (req, res) => {
      await auth.confirmReset(req.body.token, req.body.password);
      res.json({ message: 'Password changed. Sign in with the new password.' });
    },
  );
  return api;
}

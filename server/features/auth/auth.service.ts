import { Op, type Sequelize } from 'sequelize';
import type { SignUpBody } from '@shared/api/auth.schema';
import { AppError, conflict } from '../../core/app-error';
import { hashToken, newToken } from '../../core/tokens';
import type { MailOutbox } from '../../mail/outbox';
import { Invite } from '../studios/invite.model';
import { EmailVerification } from './email-verification.model';
import { decoyPasswordHash, hashPassword, verifyPassword } from './password';
import { PasswordReset } from './password-reset.model';
import { endSessionsOf } from './sessions';
import { sessionCache } from '../../core/session';
import type { UserDto } from '@shared/api/dto';
import { accountKey, type SignInThrottle } from './sign-in-throttle';
import { User } from './user.model';

/** How long an e-mailed reset link works. */
export const RESET_TTL_MS = 60 * 60 * 1000;
/** How long a sign-up's verification link works. */
export const VERIFY_TTL_MS = 24 * 60 * 60 * 1000;

/** The one answer to every sign-up that does not come with a matching invite (security item 30). */
export const SIGN_UP_SENT = 'Check your inbox: we sent a link to finish creating your account. It works for 24 hours.';

/** Accounts: sign-up with a verified address, credential checks, password resets and changes. */
export class AuthService {
  constructor(
    private readonly outbox: MailOutbox,
    private readonly appUrl: string,
    private readonly sequelize: Sequelize,
    private readonly throttle: SignInThrottle,
  ) {}

  /**
   * Starts a sign-up. With an invite token for this very address the mailbox is already proven
   * and the account is created at once; otherwise the same work is done whether or not the
   * address has an account, and a mail goes out after the answer: a verification link, or a
   * note that the account exists.
   */
  async signUp(body: SignUpBody): Promise<User | null> {
    const passwordHash = await hashPassword(body.password);
    const existing = await User.findOne({ where: { email: body.email } });
    if (!existing && body.inviteToken && (await this.inviteProves(body.inviteToken, body.email))) {
      return User.create({ email: body.email, displayName: body.displayName, passwordHash, emailVerifiedAt: new Date() });
    }
    const { token, hash } = newToken();
    if (existing) {
      await this.outbox.post('account-exists', {
        to: body.email,
        subject: 'You already have an Emberline account',
        text: `Hello,\n\nsomeone tried to create an Emberline account with this address, which already has one.\n\nIf it was you, sign in at ${this.appUrl}/sign-in, or choose a new password at ${this.appUrl}/forgot-password.\nIf it was not you, ignore this message; nothing changed.\n`,
      });
      return null;
    }
    await EmailVerification.create({
      email: body.email,
      displayName: body.displayName,
      passwordHash,
      tokenHash: hash,
      expiresAt: new Date(Date.now() + VERIFY_TTL_MS),
    });
    await this.outbox.post('verify', {
      to: body.email,
      subject: 'Finish creating your Emberline account',
      text: `Hello,\n\nopen this link within 24 hours to finish creating your Emberline account:\n\n${this.appUrl}/verify-email?token=${token}\n\nIf you did not sign up, ignore this message; no account is created.\n`,
    });
    return null;
  }

  /** Opens a verification link: creates the account with the password chosen at sign-up. */
  async verifyEmail(token: string): Promise<User> {
    return this.sequelize.transaction(async (transaction) => {
      const pending = await EmailVerification.findOne({
        where: { tokenHash: hashToken(token) },
        lock: transaction.LOCK.UPDATE,
        transaction,
      });
      if (!pending || pending.usedAt)
        throw new AppError(
          400,
          'verify_link_invalid',
          'This link was already used or is not valid. Sign in, or sign up again for a new link.',
        );
      if (pending.expiresAt.getTime() < Date.now())
        throw new AppError(400, 'verify_link_expired', 'This link has expired. Sign up again for a new one.');
      await pending.update({ usedAt: new Date() }, { transaction });
      // Every other pending sign-up of the address dies with this one.
      await EmailVerification.update({ usedAt: new Date() }, { where: { email: pending.email, usedAt: { [Op.is]: null } }, transaction });
      const existing = await User.findOne({ where: { email: pending.email }, transaction });
      // An account from before verification existed confirms its address with a link it asked for.
      if (existing && !existing.emailVerifiedAt && existing.passwordHash === pending.passwordHash) {
        return existing.update({ emailVerifiedAt: new Date() }, { transaction });
      }
      if (existing) throw conflict('account_exists', 'This address already has an account. Sign in, or reset the password.');
      return User.create(
        { email: pending.email, displayName: pending.displayName, passwordHash: pending.passwordHash, emailVerifiedAt: new Date() },
        { transaction },
      );
    });
  }

  /** Sends a new verification link to a signed-in account that has none yet (accounts from before verification). */
  async resendVerification(userId: string): Promise<void> {
    const user = await User.findByPk(userId);
    if (!user || user.emailVerifiedAt) return;
    const { token, hash } = newToken();
    await EmailVerification.create({
      email: user.email,
      displayName: user.displayName,
      passwordHash: user.passwordHash,
      tokenHash: hash,
      expiresAt: new Date(Date.now() + VERIFY_TTL_MS),
    });
    await this.outbox.post('verify', {
      to: user.email,
      subject: 'Confirm your address for Emberline',
      text: `Hello,\n\nopen this link within 24 hours to confirm that this address is yours:\n\n${this.appUrl}/verify-email?token=${token}\n`,
    });
  }

  /** The user for these credentials, or null; unknown e-mails cost the same argon2 work. */
  async checkCredentials(email: string, password: string): Promise<User | null> {
    const user = await User.findOne({ where: { email: email.trim().toLowerCase() } });
    const ok = await verifyPassword(user?.passwordHash ?? (await decoyPasswordHash()), password);
    return user && ok ? user : null;
  }

  /**
   * Mails a single-use reset link when the account exists; the answer and its timing are the
   * same either way (the mail goes out after it). A new link voids the earlier ones.
   */
  async requestReset(email: string): Promise<void> {
    const user = await User.findOne({ where: { email } });
    const { token, hash } = newToken();
    if (!user) {
      // The same throttle bookkeeping as for a real account, so the timing matches; nothing is sent.
      await this.outbox.count('reset', email);
      return;
    }
    await this.sequelize.transaction(async (transaction) => {
      await PasswordReset.update({ usedAt: new Date() }, { where: { userId: user.id, usedAt: { [Op.is]: null } }, transaction });
      await PasswordReset.create({ userId: user.id, tokenHash: hash, expiresAt: new Date(Date.now() + RESET_TTL_MS) }, { transaction });
      await this.outbox.post(
        'reset',
        {
          to: user.email,
          subject: 'Reset your Emberline password',
          text: `Hello ${user.displayName},\n\nsomeone asked to reset the password of your Emberline account. Open this link within an hour to choose a new one:\n\n${this.appUrl}/reset-password?token=${token}\n\nIf it was not you, ignore this message; your password stays as it is.\n`,
        },
        null,
        transaction,
      );
    });
  }

  /** Whether a reset link still works (so the page can say so before the user types a password). */
  async resetLinkWorks(token: string): Promise<boolean> {
    if (!/^[A-Za-z0-9_-]{20,100}$/.test(token)) return false;
    const reset = await PasswordReset.findOne({ where: { tokenHash: hashToken(token) } });
    return !!reset && !reset.usedAt && reset.expiresAt.getTime() > Date.now();
  }

  /**
   * Sets a new password with a reset token. Every reset link of the account dies, every session
   * of the account ends, the address counts as proven and the sign-in back-off is cleared.
   */
  async confirmReset(token: string, password: string): Promise<void> {
    const passwordHash = await hashPassword(password);
    const user = await this.sequelize.transaction(async (transaction) => {
      const reset = await PasswordReset.findOne({ where: { tokenHash: hashToken(token) }, lock: transaction.LOCK.UPDATE, transaction });
      if (!reset || reset.usedAt)
        throw new AppError(400, 'reset_link_invalid', 'This reset link was already used or replaced by a newer one. Ask for a new one.');
      if (reset.expiresAt.getTime() < Date.now())
        throw new AppError(400, 'reset_link_invalid', 'This reset link has expired. Ask for a new one.');
      await PasswordReset.update({ usedAt: new Date() }, { where: { userId: reset.userId, usedAt: { [Op.is]: null } }, transaction });
      const account = (await User.findByPk(reset.userId, { transaction, lock: transaction.LOCK.UPDATE }))!;
      await account.update({ passwordHash, emailVerifiedAt: account.emailVerifiedAt ?? new Date() }, { transaction });
      await endSessionsOf(this.sequelize, account.id, null, transaction);
      return account;
    });
    await this.throttle.clear(accountKey(user.email));
  }

  /** Changes the password of a signed-in account after checking the current one; ends its other sessions. */
  /** Changes the display name; every stored session of the account shows the new one. */
  async rename(userId: string, displayName: string): Promise<UserDto> {
    const user = await User.findByPk(userId);
    if (!user) throw new AppError(404, 'not_found', 'The account was not found.');
    await user.update({ displayName });
    await this.sequelize.query(
      `UPDATE sessions SET sess = jsonb_set(sess::jsonb, '{passport,user,displayName}', to_jsonb($2::text))::json WHERE sess->'passport'->'user'->>'id' = $1`,
      { bind: [userId, displayName] },
    );
    sessionCache.forgetUser(userId, null);
    return user.toDto();
  }

  async changePassword(userId: string, current: string, next: string, keepSessionId: string): Promise<void> {
    const user = await User.findByPk(userId);
    if (!user || !(await verifyPassword(user.passwordHash, current))) {
      throw new AppError(400, 'invalid_input', 'The current password is not right.', {
        issues: [{ path: 'currentPassword', message: 'is not right' }],
      });
    }
    const passwordHash = await hashPassword(next);
    await this.sequelize.transaction(async (transaction) => {
      await user.update({ passwordHash }, { transaction });
      await PasswordReset.update({ usedAt: new Date() }, { where: { userId, usedAt: { [Op.is]: null } }, transaction });
      await endSessionsOf(this.sequelize, userId, keepSessionId, transaction);
    });
  }

  /** An open invite for exactly this address proves the mailbox (its link was mailed there). */
  private async inviteProves(token: string, email: string): Promise<boolean> {
    if (!/^[A-Za-z0-9_-]{20,100}$/.test(token)) return false;
    const invite = await Invite.findOne({
      where: { tokenHash: hashToken(token), acceptedAt: { [Op.is]: null }, expiresAt: { [Op.gt]: new Date() } },
    });
    return invite?.email === email;
  }
}

import { Op } from 'sequelize';
import type { SignUpBody } from '../../../shared/api/auth.schema';
import { AppError, conflict } from '../../core/app-error';
import { hashToken, newToken } from '../../core/tokens';
import type { Mailer } from '../../mail/mailer';
import { decoyPasswordHash, hashPassword, verifyPassword } from './password';
import { PasswordReset } from './password-reset.model';
import { User } from './user.model';

/** How long an e-mailed reset link works. */
export const RESET_TTL_MS = 60 * 60 * 1000;

/** Accounts: sign-up, credential checks and password resets. */
export class AuthService {
  constructor(
    private readonly mailer: Mailer,
    private readonly appUrl: string,
  ) {}

  async signUp(body: SignUpBody): Promise<User> {
    const existing = await User.findOne({ where: { email: body.email } });
    if (existing) throw conflict('email_taken', 'An account with this e-mail already exists. Sign in, or reset the password.');
    return User.create({ email: body.email, displayName: body.displayName, passwordHash: await hashPassword(body.password) });
  }

  /** The user for these credentials, or null; unknown e-mails cost the same argon2 work. */
  async checkCredentials(email: string, password: string): Promise<User | null> {
    const user = await User.findOne({ where: { email: email.trim().toLowerCase() } });
    const ok = await verifyPassword(user?.passwordHash ?? (await decoyPasswordHash()), password);
    return user && ok ? user : null;
  }

  /** Mails a single-use reset link when the account exists; answers the same either way. */
  async requestReset(email: string): Promise<void> {
    const user = await User.findOne({ where: { email } });
    if (!user) return;
    const { token, hash } = newToken();
    await PasswordReset.create({ userId: user.id, tokenHash: hash, expiresAt: new Date(Date.now() + RESET_TTL_MS) });
    const link = `${this.appUrl}/reset-password?token=${token}`;
    await this.mailer.send({
      to: user.email,
      subject: 'Reset your Emberline password',
      text: `Hello ${user.displayName},\n\nsomeone asked to reset the password of your Emberline account. Open this link within an hour to choose a new one:\n\n${link}\n\nIf it was not you, ignore this message; your password stays as it is.\n`,
    });
  }

  async confirmReset(token: string, password: string): Promise<void> {
    const reset = await PasswordReset.findOne({
      where: { tokenHash: hashToken(token), usedAt: { [Op.is]: null }, expiresAt: { [Op.gt]: new Date() } },
    });
    if (!reset) throw new AppError(400, 'reset_link_invalid', 'This reset link is expired or was already used. Ask for a new one.');
    const passwordHash = await hashPassword(password);
    await User.sequelize!.transaction(async (transaction) => {
      const [claimed] = await PasswordReset.update(
        { usedAt: new Date() },
        { where: { id: reset.id, usedAt: { [Op.is]: null } }, transaction },
      );
      if (claimed !== 1) throw new AppError(400, 'reset_link_invalid', 'This reset link was already used. Ask for a new one.');
      await User.update({ passwordHash }, { where: { id: reset.userId }, transaction });
    });
  }
}

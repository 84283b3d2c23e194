import type { Sequelize, Transaction } from 'sequelize';
import { AppError } from '../core/app-error';
import type { MailMessage, Mailer } from './mailer';

/** Mail throttles (security item 31): per recipient address and per sending account, per hour. */
export const MAIL_LIMITS = {
  /** Mails of any kind to one address in an hour. */
  perRecipientPerHour: 5,
  /** Invitations one account may send in an hour. */
  perAccountPerHour: 30,
};

/** What kind of mail, for the log and the throttle. */
export type MailKind = 'verify' | 'account-exists' | 'reset' | 'invite';

/**
 * Outgoing mail: counted in PostgreSQL (so a restart keeps the throttle) and sent after the
 * HTTP response, so an answer takes the same time whether or not a mail goes out (security item 30).
 */
export class MailOutbox {
  constructor(
    private readonly mailer: Mailer,
    private readonly sequelize: Sequelize,
  ) {}

  /**
   * Logs the mail and queues it, or returns false when the recipient has had its hourly share.
   * With `accountId` (invites) the sender's hourly share is checked too and an excess throws 429.
   */
  async post(kind: MailKind, message: MailMessage, accountId: string | null = null, transaction?: Transaction): Promise<boolean> {
    if (!(await this.count(kind, message.to, accountId, transaction))) return false;
    const send = () =>
      this.mailer.send(message).catch((err: Error) => console.error(`[mail] ${kind} mail could not be sent: ${err.message}`));
    // After the transaction commits (if any), and after the response has been written.
    if (transaction) transaction.afterCommit(() => void setImmediate(send));
    else setImmediate(send);
    return true;
  }

  /** Checks the throttles and logs one mail to `to` without sending it; false when the recipient is over its share. */
  async count(kind: MailKind, to: string, accountId: string | null = null, transaction?: Transaction): Promise<boolean> {
    const recipient = to.toLowerCase();
    const [[counts]] = (await this.sequelize.query(
      `SELECT
         (SELECT count(*) FROM mail_log WHERE recipient = $1 AND created_at > now() - interval '1 hour')::int AS "toRecipient",
         (SELECT count(*) FROM mail_log WHERE account_id = $2 AND created_at > now() - interval '1 hour')::int AS "byAccount"`,
      { bind: [recipient, accountId], transaction },
    )) as [{ toRecipient: number; byAccount: number }[], unknown];
    if (accountId && counts.byAccount >= MAIL_LIMITS.perAccountPerHour) {
      throw new AppError(
        429,
        'mail_throttled',
        `You have sent ${MAIL_LIMITS.perAccountPerHour} invitations in the last hour, the most allowed. Try again later.`,
      );
    }
    if (counts.toRecipient >= MAIL_LIMITS.perRecipientPerHour) return false;
    await this.sequelize.query('INSERT INTO mail_log (recipient, account_id, kind) VALUES ($1, $2, $3)', {
      bind: [recipient, accountId, kind],
      transaction,
    });
    return true;
  }
}

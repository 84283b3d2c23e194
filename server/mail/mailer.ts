import nodemailer, { type Transporter } from 'nodemailer';
import type { Config } from '../config';

/** An outgoing message in plain text with an optional HTML alternative. */
export interface MailMessage {
  to: string;
  subject: string;
  text: string;
  html?: string;
}

/** Sends mail over SMTP (in development and tests: the local mail catcher). */
export class Mailer {
  private readonly transport: Transporter;

  constructor(private readonly smtp: Config['smtp']) {
    this.transport = nodemailer.createTransport({
      host: smtp.host,
      port: smtp.port,
      secure: false,
      ignoreTLS: smtp.host === '127.0.0.1' || smtp.host === 'localhost',
      connectionTimeout: 5000,
    });
  }

  async send(message: MailMessage): Promise<void> {
    await this.transport.sendMail({ from: this.smtp.from, ...message });
  }

  close(): void {
    this.transport.close();
  }
}

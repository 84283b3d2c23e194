import { simpleParser } from 'mailparser';
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { SMTPServer } from 'smtp-server';
import ports from '../default-ports.json';

/** A message as the catcher keeps it. */
export interface CaughtMail {
  id: number;
  to: string[];
  from: string;
  subject: string;
  text: string;
  receivedAt: string;
}

/**
 * A local stand-in for a mail provider: an SMTP server on loopback that keeps every message
 * in memory, and a small HTTP inbox (HTML at /, JSON at /api/messages) to read them.
 */
export class MailCatcher {
  readonly messages: CaughtMail[] = [];
  private smtp?: SMTPServer;
  private http?: Server;
  private waiters: (() => void)[] = [];

  async start(smtpPort = ports.smtp, httpPort = ports.mailUi): Promise<{ smtpPort: number; httpPort: number }> {
    this.smtp = new SMTPServer({
      authOptional: true,
      disabledCommands: ['STARTTLS', 'AUTH'],
      banner: 'Emberline mail catcher',
      size: 5 * 1024 * 1024,
      onData: (stream, session, callback) => {
        simpleParser(stream)
          .then((parsed) => {
            this.messages.push({
              id: this.messages.length + 1,
              to: session.envelope.rcptTo.map((r) => r.address.toLowerCase()),
              from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
              subject: parsed.subject ?? '',
              text: parsed.text ?? '',
              receivedAt: new Date().toISOString(),
            });
            this.waiters.splice(0).forEach((wake) => wake());
            callback();
          })
          .catch(callback);
      },
    });
    await new Promise<void>((resolve, reject) => {
      this.smtp!.once('error', reject);
      this.smtp!.listen(smtpPort, '127.0.0.1', () => resolve());
    });
    this.http = createServer((req, res) => this.serveInbox(req.url ?? '/', res));
    await new Promise<void>((resolve) => this.http!.listen(httpPort, '127.0.0.1', () => resolve()));
    return {
      smtpPort: (this.smtp.server.address() as AddressInfo).port,
      httpPort: (this.http.address() as AddressInfo).port,
    };
  }

  /** Resolves with the newest message to `to` once it has arrived (or rejects after `timeoutMs`). */
  async waitFor(to: string, timeoutMs = 5000, since = 0): Promise<CaughtMail> {
    const deadline = Date.now() + timeoutMs;
    for (;;) {
      const found = this.messages.filter((m) => m.id > since && m.to.includes(to.toLowerCase())).at(-1);
      if (found) return found;
      const left = deadline - Date.now();
      if (left <= 0) throw new Error(`no mail to ${to} within ${timeoutMs} ms`);
      await new Promise<void>((resolve) => {
        const timer = setTimeout(resolve, left);
        this.waiters.push(() => {
          clearTimeout(timer);
          resolve();
        });
      });
    }
  }

  async stop(): Promise<void> {
    await new Promise<void>((resolve) => (this.smtp ? this.smtp.close(() => resolve()) : resolve()));
    await new Promise<void>((resolve) => (this.http ? this.http.close(() => resolve()) : resolve()));
  }

  private serveInbox(url: string, res: import('node:http').ServerResponse): void {
    if (url.startsWith('/api/messages')) {
      res.writeHead(200, { 'content-type': 'application/json' });
      res.end(JSON.stringify(this.messages));
      return;
    }
    const escape = (s: string) => s.replace(/[&<>"]/g, (c) => `&#${c.charCodeAt(0)};`);
    const rows = [...this.messages]
      .reverse()
      .map(
        (m) =>
          `<article><h2>${escape(m.subject)}</h2><p>To ${escape(m.to.join(', '))} · ${m.receivedAt}</p><pre>${escape(m.text)}</pre></article>`,
      )
      .join('');
    res.writeHead(200, {
      'content-type': 'text/html; charset=utf-8',
      'content-security-policy': "default-src 'none'; style-src 'unsafe-inline'",
    });
    res.end(
      `<!doctype html><meta charset="utf-8"><title>Emberline mail catcher</title>` +
        `<style>body{font:14px system-ui;margin:2rem;max-width:60rem}article{border-bottom:1px solid #ccc;padding:1rem 0}pre{white-space:pre-wrap}</style>` +
        `<h1>Mail catcher inbox (${this.messages.length})</h1>${rows || '<p>No mail yet.</p>'}`,
    );
  }
}

if (require.main === module) {
  const catcher = new MailCatcher();
  const smtpPort = Number(process.env.SMTP_PORT ?? ports.smtp);
  const httpPort = Number(process.env.MAIL_UI_PORT ?? ports.mailUi);
  catcher.start(smtpPort, httpPort).then(
    (ports) => console.log(`[mail] catching SMTP on 127.0.0.1:${ports.smtpPort}; inbox at http://127.0.0.1:${ports.httpPort}/`),
    (err) => {
      console.error(`[mail] could not start: ${err.message}`);
      process.exit(1);
    },
  );
}

#!/usr/bin/env node
// `npm run dev`: the dev loop. Database and mail catcher as `npm start` starts them, the server
// under `tsx watch` (restarted when a file it imports changes), and `ng serve` with live
// reload on http://127.0.0.1:4200/, which passes /api to the server (proxy.conf.json). Reads .env
// when there is one. Everything listens on 127.0.0.1 only.
import { existsSync } from 'node:fs';
import { start as startDb } from './db.mjs';
import { supervise, tsNode } from './supervise.mjs';
import ports from '../server/default-ports.json' with { type: 'json' };

if (existsSync('.env')) process.loadEnvFile('.env');
const port = process.env.PORT ?? String(ports.server);
const uiPort = process.env.DEV_UI_PORT ?? String(ports.devUi);
const smtpPort = process.env.SMTP_PORT ?? String(ports.smtp);
const mailUiPort = process.env.MAIL_UI_PORT ?? String(ports.mailUi);

startDb([process.env.DB_NAME ?? 'emberline']);

// Links in mails point at the dev server's page, which passes /api on.
const env = {
  ...process.env,
  PORT: port,
  SMTP_PORT: smtpPort,
  MAIL_UI_PORT: mailUiPort,
  SEED_DEMO: '1',
  APP_URL: process.env.APP_URL ?? `http://127.0.0.1:${uiPort}`,
  STATIC_DIR: '/nonexistent',
};
supervise([
  { name: 'mail catcher', ...tsNode('server/mail/catcher.ts'), env },
  {
    name: 'server (restarted when its files change)',
    command: 'npx',
    args: ['tsx', 'watch', '--clear-screen=false', 'server/main.ts'],
    env,
  },
  { name: 'web app (ng serve)', command: 'npx', args: ['ng', 'serve', '--port', uiPort], env },
]);
console.log(`[dev] open http://127.0.0.1:${uiPort}/ (live reload; the API runs on ${port}); mail inbox at http://127.0.0.1:${mailUiPort}/`);

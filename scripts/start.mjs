#!/usr/bin/env node
// `npm start`: database, mail catcher, a production build of the web app, then the server with
// the demo data (reading .env when there is one). Everything listens on 127.0.0.1 only. The
// server is restarted if it dies; if the mail catcher dies, everything stops and says which.
import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { start as startDb } from './db.mjs';
import { supervise, tsNode } from './supervise.mjs';
import ports from '../server/default-ports.json' with { type: 'json' };

if (existsSync('.env')) process.loadEnvFile('.env');
const port = process.env.PORT ?? String(ports.server);
const smtpPort = process.env.SMTP_PORT ?? String(ports.smtp);
const mailUiPort = process.env.MAIL_UI_PORT ?? String(ports.mailUi);

startDb([process.env.DB_NAME ?? 'emberline']);

if (process.env.SKIP_BUILD !== '1') {
  console.log('[start] building the web app…');
  const build = spawnSync('npx', ['ng', 'build'], { stdio: 'inherit' });
  if (build.status !== 0) process.exit(build.status ?? 1);
}

const env = { ...process.env, PORT: port, SMTP_PORT: smtpPort, MAIL_UI_PORT: mailUiPort, SEED_DEMO: '1' };
supervise([
  { name: 'mail catcher', ...tsNode('server/mail/catcher.ts'), env },
  { name: 'server', ...tsNode('server/main.ts'), env, restart: true },
]);
console.log(
  `[start] open http://127.0.0.1:${port}/ — demo accounts and password are in README.md; mail inbox at http://127.0.0.1:${mailUiPort}/`,
);

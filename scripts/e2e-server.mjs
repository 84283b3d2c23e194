#!/usr/bin/env node
// The server the browser tests run against: its own database (recreated each run), mail
// catcher and port, over the production build in dist/ (scripts/test.mjs builds it).
import { spawnSync } from 'node:child_process';
import { pgPort, start as startDb } from './db.mjs';
import { supervise, tsNode } from './supervise.mjs';
import ports from '../server/default-ports.json' with { type: 'json' };

const port = process.env.E2E_PORT ?? String(ports.e2eServer);
const smtpPort = process.env.E2E_SMTP_PORT ?? String(ports.e2eSmtp);
const mailUiPort = process.env.E2E_MAIL_UI_PORT ?? String(ports.e2eMailUi);

startDb(['postgres']);
spawnSync(
  'psql',
  [
    '-h',
    '127.0.0.1',
    '-p',
    String(pgPort),
    '-U',
    'emberline',
    '-d',
    'postgres',
    '-qc',
    'DROP DATABASE IF EXISTS emberline_e2e WITH (FORCE)',
  ],
  { stdio: 'inherit' },
);
startDb(['emberline_e2e']);

const env = {
  ...process.env,
  NODE_ENV: 'test',
  PORT: port,
  SMTP_PORT: smtpPort,
  MAIL_UI_PORT: mailUiPort,
  DB_NAME: 'emberline_e2e',
  SEED_DEMO: '1',
  APP_URL: `http://127.0.0.1:${port}`,
};
supervise([
  { name: 'mail catcher', ...tsNode('server/mail/catcher.ts'), env },
  { name: 'server', ...tsNode('server/main.ts'), env },
]);

#!/usr/bin/env node
// `npm test`: everything, starting what it needs. PostgreSQL (installed from Debian's packages
// when missing) with a fresh test database, the jest projects, the reliability drills, a production build, then the
// Playwright browser tests in Debian's chromium (installed when missing).
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { pgPort, start as startDb, stop as stopDb } from './db.mjs';

const only = process.argv[2]; // optional: "unit", "reliability" or "e2e"
// Stop the database afterwards only if this run started it.
const startedDb = startDb(['postgres']);
const finish = (code) => {
  if (startedDb) stopDb();
  process.exit(code);
};
const run = (cmd, args, env = {}) => {
  const r = spawnSync(cmd, args, { stdio: 'inherit', env: { ...process.env, ...env } });
  if (r.status !== 0) finish(r.status ?? 1);
};

const psql = (sql) =>
  spawnSync('psql', ['-h', '127.0.0.1', '-p', String(pgPort), '-U', 'emberline', '-d', 'postgres', '-qc', sql], { stdio: 'inherit' });

// Lint (ESLint, then the layers' dependency rules): seconds, so first.
if (!only || only === 'unit') run('npm', ['run', '-s', 'lint']);

if (!only || only === 'unit') {
  psql('DROP DATABASE IF EXISTS emberline_test WITH (FORCE)');
  startDb(['emberline_test']);
  run('npx', ['jest', '--ci'], { DB_NAME: 'emberline_test', NODE_ENV: 'test' });
}

// Hostile uploads, kill -9 and a PostgreSQL outage against real server processes: alone, in band.
if (!only || only === 'reliability') run('npx', ['jest', '--ci', '-c', 'jest.reliability.config.js'], { NODE_ENV: 'test' });

if (!only || only === 'e2e') {
  const chromium = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
  if (!existsSync(chromium)) {
    console.log("[test] installing Debian's chromium package for the browser tests…");
    execFileSync('apt-get', ['update', '-qq'], { stdio: 'inherit' });
    execFileSync('apt-get', ['install', '-y', '-qq', '--no-install-recommends', 'chromium'], {
      stdio: 'inherit',
      env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' },
    });
  }
  run('npx', ['ng', 'build']);
  run('npx', ['playwright', 'test']);
}
finish(0);

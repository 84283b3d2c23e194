#!/usr/bin/env node
// Private PostgreSQL cluster on loopback for development and tests.
//   node scripts/db.mjs start [database…]   init (once), start, create the databases
//   node scripts/db.mjs stop
//   node scripts/db.mjs status
// Uses Debian's server binaries (installs the `postgresql` package when they are missing).
// PostgreSQL refuses to run as root, so as root every server command runs as `postgres`.
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, readdirSync, readFileSync, chownSync, writeFileSync } from 'node:fs';
import { userInfo } from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import ports from '../server/default-ports.json' with { type: 'json' };

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const dataRoot = path.join(root, '.data');
const clusterDir = path.join(dataRoot, 'pg');
const socketDir = path.join(dataRoot, 'pg-socket');
const logFile = path.join(dataRoot, 'pg.log');
export const pgPort = Number(process.env.DB_PORT ?? ports.database);
export const pgUser = 'emberline';
const isRoot = userInfo().uid === 0;

function findBinDir() {
  const base = '/usr/lib/postgresql';
  if (!existsSync(base)) return null;
  const versions = readdirSync(base).filter((v) => existsSync(path.join(base, v, 'bin', 'pg_ctl')));
  versions.sort((a, b) => Number(b) - Number(a));
  return versions.length ? path.join(base, versions[0], 'bin') : null;
}

function ensureBinaries() {
  let bin = findBinDir();
  if (bin) return bin;
  if (!isRoot) throw new Error('PostgreSQL server binaries are missing: run `apt-get install -y postgresql` as root.');
  console.log("[db] installing Debian's postgresql package…");
  execFileSync('apt-get', ['update', '-qq'], { stdio: 'inherit' });
  execFileSync('apt-get', ['install', '-y', '-qq', '--no-install-recommends', 'postgresql'], {
    stdio: 'inherit',
    env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' },
  });
  bin = findBinDir();
  if (!bin) throw new Error('PostgreSQL server binaries not found after installing the package.');
  return bin;
}

/** Runs a server binary, as the postgres user when we are root. */
function runPg(bin, tool, args, opts = {}) {
  const exe = path.join(bin, tool);
  const [cmd, argv] = isRoot ? ['runuser', ['-u', 'postgres', '--', exe, ...args]] : [exe, args];
  return spawnSync(cmd, argv, { encoding: 'utf8', ...opts });
}

function ensureDirs() {
  for (const dir of [dataRoot, socketDir]) mkdirSync(dir, { recursive: true, mode: 0o700 });
  if (isRoot) {
    const uid = Number(execFileSync('id', ['-u', 'postgres']).toString().trim());
    const gid = Number(execFileSync('id', ['-g', 'postgres']).toString().trim());
    chownSync(dataRoot, uid, gid);
    chownSync(socketDir, uid, gid);
    // The server runs as postgres, which must be able to pass through every folder above the cluster.
    if (spawnSync('runuser', ['-u', 'postgres', '--', 'test', '-x', dataRoot]).status !== 0) {
      let closed = path.dirname(dataRoot);
      for (let dir = closed; dir !== path.dirname(dir); dir = path.dirname(dir)) {
        if (spawnSync('runuser', ['-u', 'postgres', '--', 'test', '-x', dir]).status !== 0) closed = dir;
      }
      throw new Error(
        `PostgreSQL runs as the postgres user, which cannot enter ${closed} (and so not the cluster in ${dataRoot}). Let it pass with \`chmod o+x ${closed}\`, or clone the project into a folder other users can enter.`,
      );
    }
    if (!existsSync(logFile)) writeFileSync(logFile, '');
    chownSync(logFile, uid, gid);
  }
}

function initCluster(bin) {
  if (existsSync(path.join(clusterDir, 'PG_VERSION'))) return;
  console.log('[db] creating a private cluster in .data/pg');
  const r = runPg(bin, 'initdb', ['-D', clusterDir, '-U', pgUser, '--auth=trust', '-E', 'UTF8', '--locale=C.UTF-8']);
  if (r.status !== 0) throw new Error(`initdb failed:\n${r.stdout}\n${r.stderr}`);
}

function isRunning(bin) {
  return runPg(bin, 'pg_ctl', ['-D', clusterDir, 'status']).status === 0;
}

function psql(sql, database = 'postgres') {
  return spawnSync('psql', ['-h', '127.0.0.1', '-p', String(pgPort), '-U', pgUser, '-d', database, '-tAc', sql], {
    encoding: 'utf8',
  });
}

function createDatabase(name) {
  if (!/^[a-z_][a-z0-9_]*$/.test(name)) throw new Error(`bad database name: ${name}`);
  const exists = psql(`SELECT 1 FROM pg_database WHERE datname = '${name}'`).stdout.trim() === '1';
  if (!exists) {
    const r = psql(`CREATE DATABASE ${name}`);
    if (r.status !== 0) throw new Error(`CREATE DATABASE ${name} failed: ${r.stderr}`);
    console.log(`[db] created database ${name}`);
  }
}

/** Starts the cluster if needed and creates the databases; returns true when this call started it. */
export function start(databases = ['emberline']) {
  const bin = ensureBinaries();
  ensureDirs();
  initCluster(bin);
  const wasRunning = isRunning(bin);
  if (!wasRunning) {
    const opts = `-c listen_addresses=127.0.0.1 -p ${pgPort} -k ${socketDir} -c fsync=on`;
    const r = runPg(bin, 'pg_ctl', ['-D', clusterDir, '-l', logFile, '-w', '-t', '30', '-o', opts, 'start']);
    if (r.status !== 0) {
      const log = existsSync(logFile) ? readFileSync(logFile, 'utf8') : '';
      const taken = /Address already in use/.test(log.slice(-4000));
      throw new Error(
        taken
          ? `port ${pgPort} on 127.0.0.1 is already taken (another PostgreSQL, perhaps from another checkout): stop it, or set DB_PORT to a free port.`
          : `pg_ctl start failed (see .data/pg.log):\n${r.stdout}\n${r.stderr}`,
      );
    }
    console.log(`[db] PostgreSQL listening on 127.0.0.1:${pgPort}`);
  }
  for (const name of databases) createDatabase(name);
  return !wasRunning;
}

export function stop() {
  const bin = findBinDir();
  if (!bin || !existsSync(clusterDir) || !isRunning(bin)) return;
  runPg(bin, 'pg_ctl', ['-D', clusterDir, '-m', 'fast', '-w', 'stop'], { stdio: 'inherit' });
}

if (process.argv[1] === fileURLToPath(import.meta.url)) {
  const [command = 'status', ...rest] = process.argv.slice(2);
  try {
    if (command === 'start') start(rest.length ? rest : undefined);
    else if (command === 'stop') stop();
    else if (command === 'status') {
      const bin = findBinDir();
      console.log(bin && existsSync(clusterDir) && isRunning(bin) ? 'running' : 'stopped');
    } else {
      console.error('usage: node scripts/db.mjs start [database…] | stop | status');
      process.exit(2);
    }
  } catch (err) {
    console.error(`[db] ${err.message}`);
    process.exit(1);
  }
}

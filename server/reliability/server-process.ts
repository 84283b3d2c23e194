import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { Client } from 'pg';
import { loadConfig } from '../config';

/** A real server process for the reliability drills: its own port, database and storage folder. */
export interface ServerProcess {
  url: string;
  child: ChildProcess;
  /** Everything the process printed, for the failure message. */
  output(): string;
  /** Peak resident memory of the process so far (VmHWM), in MiB. */
  peakRssMb(): number;
  kill(signal?: NodeJS.Signals): Promise<void>;
}

const ROOT = path.resolve(__dirname, '../..');

/** Starts `server/main.ts` with node --require tsx/cjs (as `npm start` does) and waits until /api/health answers. */
export async function startServer(options: {
  port: number;
  database: string;
  storageDir: string;
  seed?: boolean;
  env?: NodeJS.ProcessEnv;
  nodeArgs?: string[];
}): Promise<ServerProcess> {
  const env = {
    ...process.env,
    NODE_ENV: 'test',
    PORT: String(options.port),
    DB_NAME: options.database,
    STORAGE_DIR: options.storageDir,
    // Nothing listens there: mail is logged as failed, which these drills do not need.
    SMTP_PORT: '9',
    SEED_DEMO: options.seed ? '1' : '0',
    STATIC_DIR: '/nonexistent',
    ...options.env,
  };
  const url = `http://127.0.0.1:${options.port}`;
  // A server left over from an interrupted run would answer in our place: refuse to start beside it.
  if (
    await fetch(`${url}/api/health`).then(
      () => true,
      () => false,
    )
  )
    throw new Error(`port ${options.port} is taken by another process; stop it first`);
  const child = spawn(process.execPath, [...(options.nodeArgs ?? []), '--require', 'tsx/cjs', 'server/main.ts'], {
    cwd: ROOT,
    env,
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let output = '';
  child.stdout!.on('data', (d) => (output += d));
  child.stderr!.on('data', (d) => (output += d));
  // Never outlive the drill that started it.
  const reap = () => child.kill('SIGKILL');
  process.once('exit', reap);
  child.once('exit', () => process.removeListener('exit', reap));
  const deadline = Date.now() + 60_000;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`the server exited while starting:\n${output}`);
    const ok = await fetch(`${url}/api/health`).then(
      (r) => r.ok,
      () => false,
    );
    if (ok) break;
    if (Date.now() > deadline) throw new Error(`the server did not answer within 60 s:\n${output}`);
    await new Promise((r) => setTimeout(r, 200));
  }
  return {
    url,
    child,
    output: () => output,
    peakRssMb: () => {
      const status = readFileSync(`/proc/${child.pid}/status`, 'utf8');
      return Number(status.match(/VmHWM:\s+(\d+) kB/)![1]) / 1024;
    },
    kill: (signal = 'SIGTERM') =>
      new Promise<void>((resolve) => {
        if (child.exitCode !== null || child.signalCode !== null) return resolve();
        child.once('exit', () => resolve());
        child.kill(signal);
      }),
  };
}

/** A signed-in browser-like session over fetch: cookies, the CSRF token, JSON and multipart calls. */
export class ApiSession {
  private cookies = new Map<string, string>();

  constructor(readonly base: string) {}

  static async signIn(base: string, email: string, password: string): Promise<ApiSession> {
    const s = new ApiSession(base);
    const res = await s.send('POST', '/api/auth/sign-in', { email, password });
    if (res.status !== 200) throw new Error(`sign-in failed: ${res.status} ${await res.text()}`);
    return s;
  }

  async send(method: string, urlPath: string, body?: unknown): Promise<Response> {
    // The whole body, not just the headers: express-session finishes saving a new session before the last byte.
    if (method !== 'GET' && !this.cookies.has('XSRF-TOKEN')) await (await this.send('GET', '/api/auth/csrf')).arrayBuffer();
    const headers: Record<string, string> = { cookie: this.cookieHeader() };
    if (method !== 'GET') headers['x-xsrf-token'] = this.cookies.get('XSRF-TOKEN') ?? '';
    let payload: BodyInit | undefined;
    if (body instanceof FormData) payload = body;
    else if (body !== undefined) {
      headers['content-type'] = 'application/json';
      payload = JSON.stringify(body);
    }
    const res = await fetch(`${this.base}${urlPath}`, { method, headers, body: payload });
    for (const line of res.headers.getSetCookie()) {
      const [pair] = line.split(';');
      const at = pair.indexOf('=');
      this.cookies.set(pair.slice(0, at), pair.slice(at + 1));
    }
    return res;
  }

  upload(urlPath: string, fields: Record<string, string>, file: { name: string; bytes: Buffer }): Promise<Response> {
    const form = new FormData();
    for (const [k, v] of Object.entries(fields)) form.append(k, v);
    form.append('file', new Blob([new Uint8Array(file.bytes)]), file.name);
    return this.send('POST', urlPath, form);
  }

  /** The Cookie header of this session, for tools that send their own requests. */
  cookieHeader(): string {
    return [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; ');
  }
}

/** Drops and recreates a database on the project's loopback PostgreSQL (started if needed), so a drill starts empty. */
export async function freshDatabase(name: string): Promise<void> {
  const run = (...args: string[]) => {
    const r = spawnSync(process.execPath, ['scripts/db.mjs', ...args], { cwd: ROOT, encoding: 'utf8' });
    if (r.status !== 0) throw new Error(`scripts/db.mjs ${args.join(' ')} failed: ${r.stdout}${r.stderr}`);
  };
  run('start');
  const { db } = loadConfig();
  const client = new Client({ host: db.host, port: db.port, user: db.user, database: 'postgres' });
  await client.connect();
  await client.query(`DROP DATABASE IF EXISTS "${name.replace(/"/g, '')}" WITH (FORCE)`);
  await client.end();
  run('start', name);
}

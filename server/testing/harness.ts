import type { Express } from 'express';
import { randomBytes } from 'node:crypto';
import os from 'node:os';
import path from 'node:path';
import { Pool } from 'pg';
import type { Sequelize } from 'sequelize';
import request from 'supertest';
import { createApp } from '../app';
import { loadConfig, type Config } from '../config';
import { createSequelize } from '../db/connection';
import { initModels } from '../db/models';
import { MailCatcher } from '../mail/catcher';
import { Mailer } from '../mail/mailer';
import { RenderEngine } from '../render/render-engine';
import { JobQueue } from '../jobs/job-queue';

/** A real app on the test database with a real SMTP catcher; one per spec file. */
export interface Harness {
  app: ReturnType<typeof createApp>;
  config: Config;
  sequelize: Sequelize;
  mail: MailCatcher;
  /** The job queue the app sends to; a spec that needs jobs run calls jobs.work itself. */
  jobs: JobQueue;
  /** A second app on the same database, as after a process restart (in-memory state is new). */
  restartedApp(): Harness['app'];
  close(): Promise<void>;
}

/** The catcher of this spec file's harness: TestClient.signUp opens the mailed verification link from it. */
let activeMail: MailCatcher | undefined;

export async function createHarness(overrides: Partial<Config> = {}): Promise<Harness> {
  process.env.DB_NAME ??= 'emberline_test';
  const mail = new MailCatcher();
  activeMail = mail;
  const { smtpPort } = await mail.start(0, 0);
  const base = loadConfig();
  const config: Config = {
    ...base,
    env: 'test',
    appUrl: 'http://app.test',
    smtp: { ...base.smtp, port: smtpPort },
    staticDir: '/nonexistent',
    storageDir: path.join(os.tmpdir(), `emberline-test-${process.pid}`),
    ...overrides,
  };
  const sequelize = createSequelize(config.db);
  initModels(sequelize);
  const sessionPool = new Pool({ host: config.db.host, port: config.db.port, database: config.db.database, user: config.db.user, max: 3 });
  sessionPool.on('error', () => undefined);
  const mailer = new Mailer(config.smtp);
  // One pool for the spec file, shared by restartedApp(): two small threads keep parallel spec files light.
  const renderEngine = new RenderEngine({ threads: 2 });
  const jobs = JobQueue.create(config.db, config.jobs);
  const deps = { config, sequelize, sessionPool, mailer, renderEngine, jobs };
  const app = createApp(deps);
  return {
    app,
    config,
    sequelize,
    mail,
    restartedApp: () => createApp(deps),
    jobs,
    async close() {
      await jobs.stop(2_000);
      mailer.close();
      await renderEngine.close();
      await mail.stop();
      await sessionPool.end();
      await sequelize.close();
    },
  };
}

/** A unique e-mail for this test run. */
export function uniqueEmail(tag = 'user'): string {
  return `${tag}-${Date.now().toString(36)}-${Math.random().toString(36).slice(2, 8)}@test.example`;
}

/**
 * A browser-like client: keeps cookies between calls and echoes XSRF-TOKEN in X-XSRF-TOKEN on
 * mutations, as Angular's HttpClient does.
 */
export class TestClient {
  private cookies = new Map<string, string>();
  /** Set false to send mutations without the CSRF header. */
  sendCsrf = true;
  /**
   * Extra headers on every request. Each client acts from its own address in the IPv6
   * documentation prefix (RFC 3849, 2001:db8::/32, via X-Forwarded-For, which the app trusts from
   * loopback), so the sign-in back-off of one test's client never slows another's.
   */
  headers: Record<string, string> = { 'X-Forwarded-For': `2001:db8:${randomBytes(12).toString('hex').match(/.{4}/g)!.join(':')}` };

  constructor(private readonly app: Express) {}

  get(path: string) {
    return this.send('get', path);
  }
  post(path: string, body: object = {}) {
    return this.send('post', path, body);
  }
  patch(path: string, body: object = {}) {
    return this.send('patch', path, body);
  }
  delete(path: string) {
    return this.send('delete', path);
  }

  /** A multipart POST: text fields plus one file as the field "file". */
  async upload(path: string, fields: Record<string, string>, file: { name: string; bytes: Buffer }): Promise<request.Response> {
    if (!this.cookies.has('XSRF-TOKEN')) await this.send('get', '/api/auth/csrf');
    let req = request(this.app)
      .post(path)
      .set('Cookie', [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; '));
    if (this.sendCsrf) req = req.set('X-XSRF-TOKEN', this.cookies.get('XSRF-TOKEN') ?? '');
    for (const [k, v] of Object.entries(fields)) req = req.field(k, v);
    return req.attach('file', file.bytes, file.name);
  }

  /** A GET whose body is read as bytes, whatever its content type, following redirects (signed download links). */
  async getBytes(path: string): Promise<request.Response & { body: Buffer }> {
    let req = request(this.app).get(path).set(this.headers).redirects(2);
    if (this.cookies.size) req = req.set('Cookie', [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; '));
    return req.buffer(true).parse((res, done) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => done(null, Buffer.concat(chunks)));
    });
  }

  cookie(name: string): string | undefined {
    return this.cookies.get(name);
  }

  setCookie(name: string, value: string): void {
    this.cookies.set(name, value);
  }

  /**
   * Signs up a new account as a person does — sign-up, then the link mailed to the catcher — and
   * keeps its session; returns its e-mail and id.
   */
  async signUp(password = 'correct horse battery', tag = 'user'): Promise<{ email: string; id: string; password: string }> {
    const email = uniqueEmail(tag);
    const since = activeMail!.messages.at(-1)?.id ?? 0;
    const res = await this.post('/api/auth/sign-up', { email, displayName: `Test ${tag}`, password });
    if (res.status !== 202) throw new Error(`sign-up failed: ${res.status} ${JSON.stringify(res.body)}`);
    const token = (await activeMail!.waitFor(email, 5000, since)).text.match(/verify-email\?token=([A-Za-z0-9_-]+)/)![1];
    const verified = await this.post('/api/auth/verify-email', { token });
    if (verified.status !== 200) throw new Error(`verification failed: ${verified.status} ${JSON.stringify(verified.body)}`);
    return { email, id: verified.body.user.id, password };
  }

  async send(method: 'get' | 'post' | 'put' | 'patch' | 'delete', path: string, body?: object): Promise<request.Response> {
    if (method !== 'get' && this.sendCsrf && !this.cookies.has('XSRF-TOKEN')) await this.send('get', '/api/auth/csrf');
    let req = request(this.app)[method](path).set(this.headers);
    if (this.cookies.size) req = req.set('Cookie', [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; '));
    if (method !== 'get' && this.sendCsrf && this.cookies.has('XSRF-TOKEN')) req = req.set('X-XSRF-TOKEN', this.cookies.get('XSRF-TOKEN')!);
    const res = body === undefined ? await req : await req.send(body);
    const setCookies = ([] as string[]).concat(res.headers['set-cookie'] ?? []);
    for (const line of setCookies) {
      const [pair] = line.split(';');
      const [name, ...rest] = pair.split('=');
      const value = rest.join('=');
      if (!value || /Expires=Thu, 01 Jan 1970/i.test(line)) this.cookies.delete(name);
      else this.cookies.set(name, value);
    }
    return res;
  }
}

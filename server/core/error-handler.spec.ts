import express from 'express';
import request from 'supertest';
import { AppError } from './app-error';
import { errorHandler, isDatabaseDown } from './error-handler';

/** security item 16 (ASVS 5.0 16.5): generic JSON errors, never a stack, the process stays up. */
describe('errorHandler', () => {
  const app = express();
  app.get('/boom', () => {
    throw new Error('secret internal detail at /srv/app.ts:12');
  });
  app.get('/typed', () => {
    throw new AppError(409, 'conflict_x', 'Readable message.', { hint: 1 });
  });
  app.get('/db-down', () => {
    throw Object.assign(new Error('connect ECONNREFUSED'), { name: 'SequelizeConnectionRefusedError' });
  });
  app.use(errorHandler);

  beforeAll(() => jest.spyOn(console, 'error').mockImplementation(() => undefined));

  test('an unexpected error is a generic 500 without its message or stack', async () => {
    const res = await request(app).get('/boom');
    expect(res.status).toBe(500);
    expect(res.body).toEqual({ error: { code: 'internal', message: expect.any(String) } });
    expect(JSON.stringify(res.body)).not.toContain('secret');
  });

  test('a typed error keeps status, code, message and details', async () => {
    const res = await request(app).get('/typed');
    expect(res.status).toBe(409);
    expect(res.body).toEqual({ error: { code: 'conflict_x', message: 'Readable message.', details: { hint: 1 } } });
  });

  test('a database outage answers 503 database_unavailable with Retry-After', async () => {
    const res = await request(app).get('/db-down');
    expect(res.status).toBe(503);
    expect(res.body.error.code).toBe('database_unavailable');
    expect(Number(res.headers['retry-after'])).toBeGreaterThan(0);
    expect((await request(app).get('/typed')).status).toBe(409);
  });

  // The shapes pg and the session store raise while PostgreSQL is away (issue "Hardening", item 9).
  test.each([
    ['pg refused', Object.assign(new Error('connect ECONNREFUSED 127.0.0.1:54329'), { code: 'ECONNREFUSED' })],
    [
      'pg AggregateError (IPv4 and IPv6 both refused)',
      Object.assign(new AggregateError([Object.assign(new Error('x'), { code: 'ECONNREFUSED' })], ''), {}),
    ],
    [
      'server shutting down (SQLSTATE 57P01)',
      Object.assign(new Error('terminating connection due to administrator command'), { code: '57P01' }),
    ],
    ['pool connect timeout', new Error('timeout exceeded when trying to connect')],
    ['connection terminated', new Error('Connection terminated unexpectedly')],
    [
      'Sequelize wrapper',
      Object.assign(new Error('wrapped'), { name: 'SequelizeDatabaseError', parent: Object.assign(new Error('x'), { code: '57P03' }) }),
    ],
  ])('%s is recognised as an outage', (_name, err) => {
    expect(isDatabaseDown(err)).toBe(true);
  });

  test('ordinary errors are not outages', () => {
    expect(isDatabaseDown(new Error('syntax error at or near'))).toBe(false);
    expect(isDatabaseDown(Object.assign(new Error('dup'), { code: '23505' }))).toBe(false);
  });
});

describe('outage through the whole app: the session store and health (issue "Hardening", item 9; security item 24)', () => {
  test('with PostgreSQL unreachable, a signed-in request and health both answer 503 with Retry-After', async () => {
    const { createHarness, TestClient } = await import('../testing/harness');
    // A port nothing listens on: the same errors as a stopped server, without stopping the shared test database.
    const h = await createHarness({ db: { host: '127.0.0.1', port: 1, database: 'none', user: 'none', poolMax: 2 } });
    try {
      const client = new TestClient(h.app);
      // A correctly signed session cookie (express-session's "s:" + id + "." + HMAC-SHA256), so the store is asked.
      const { createHmac } = await import('node:crypto');
      const sid = 'outage-drill-session';
      const mac = createHmac('sha256', h.config.sessionSecret).update(sid).digest('base64').replace(/=+$/, '');
      client.setCookie('emberline.sid', encodeURIComponent(`s:${sid}.${mac}`));
      for (const path of ['/api/studios', '/api/health', '/api/auth/me']) {
        const res = await client.get(path);
        expect({ path, status: res.status, code: res.body.error?.code }).toEqual({ path, status: 503, code: 'database_unavailable' });
        expect(res.headers['retry-after']).toBeDefined();
      }
    } finally {
      await h.close();
    }
  });
});

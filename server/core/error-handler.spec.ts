import express from 'express';
import request from 'supertest';
import { AppError } from './app-error';
import { errorHandler } from './error-handler';

/** SECURITY.md 16 (ASVS 5.0 16.5): generic JSON errors, never a stack, the process stays up. */
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

  test('a database outage answers 503', async () => {
    expect((await request(app).get('/db-down')).status).toBe(503);
    expect((await request(app).get('/typed')).status).toBe(409);
  });
});

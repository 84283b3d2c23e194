import { Op } from 'sequelize';
import { User } from './user.model';
import { createHarness, TestClient, uniqueEmail, type Harness } from '../../testing/harness';
import { sessionCache } from '../../core/session';

let h: Harness;
beforeAll(async () => {
  h = await createHarness();
});
afterAll(() => h.close());

const sidOf = (c: TestClient) => c.cookie('emberline.sid');

describe('password storage (security item 1; ASVS 5.0 11.4.2)', () => {
  test('argon2id with m ≥ 19456 KiB, t ≥ 2, p = 1, and a fresh salt per account', async () => {
    const a = await new TestClient(h.app).signUp('same password here');
    const b = await new TestClient(h.app).signUp('same password here');
    const [ua, ub] = await Promise.all([User.findByPk(a.id), User.findByPk(b.id)]);
    const format = /^\$argon2id\$v=19\$m=(\d+),t=(\d+),p=(\d+)\$([A-Za-z0-9+/]+)\$/;
    const [, m, t, p, saltA] = ua!.passwordHash.match(format)!;
    expect(Number(m)).toBeGreaterThanOrEqual(19456);
    expect(Number(t)).toBeGreaterThanOrEqual(2);
    expect(Number(p)).toBe(1);
    const saltB = ub!.passwordHash.match(format)![4];
    expect(saltA).not.toEqual(saltB);
  });
});

describe('password rules (security item 2; ASVS 5.0 6.2)', () => {
  test.each([
    ['7 characters', 'abcdefg', 400],
    ['8 characters', 'abcdefgh', 202],
    ['128 characters', 'x'.repeat(128), 202],
    ['129 characters', 'x'.repeat(129), 400],
    ['8 astral-plane code points (16 UTF-16 units)', '🔥'.repeat(8), 202],
    ['7 astral-plane code points (14 UTF-16 units)', '🔥'.repeat(7), 400],
  ])('%s → %i', async (_name, password, status) => {
    const res = await new TestClient(h.app).post('/api/auth/sign-up', { email: uniqueEmail('pw'), displayName: 'P', password });
    expect(res.status).toBe(status);
    if (status === 400) expect(res.body.error.details.issues[0].path).toBe('password');
  });

  test('any Unicode is accepted, and a truncated variant of the password fails', async () => {
    const password = 'Zündschlüssel — 燃える琥珀 🔥 glow';
    const client = new TestClient(h.app);
    const { email } = await client.signUp(password);
    const fresh = () => new TestClient(h.app);
    expect((await fresh().post('/api/auth/sign-in', { email, password })).status).toBe(200);
    expect((await fresh().post('/api/auth/sign-in', { email, password: password.slice(0, -1) })).status).toBe(401);
    expect((await fresh().post('/api/auth/sign-in', { email, password: password.slice(0, 8) })).status).toBe(401);
  });
});

describe('sign-in', () => {
  test('a NUL character in the e-mail is a 400 with a message, not a 500 (issue "Hardening", item 10)', async () => {
    const res = await new TestClient(h.app).post('/api/auth/sign-in', { email: 'a\u0000b@test.example', password: 'whatever it is' });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/NUL character/);
  });
  test('unknown account and wrong password answer the same (security item 4; ASVS 5.0 6.3.8)', async () => {
    const { email } = await new TestClient(h.app).signUp();
    const wrong = await new TestClient(h.app).post('/api/auth/sign-in', { email, password: 'not the password' });
    const unknown = await new TestClient(h.app).post('/api/auth/sign-in', { email: uniqueEmail('ghost'), password: 'not the password' });
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(wrong.status);
    expect(unknown.body).toEqual(wrong.body);
  });

  test('the session id changes at sign-in and the old one is dead (security item 5; ASVS 5.0 7.2.4)', async () => {
    const { email, password } = await new TestClient(h.app).signUp();
    const client = new TestClient(h.app);
    await client.get('/api/auth/csrf');
    const before = sidOf(client)!;
    expect(before).toBeDefined();
    expect((await client.post('/api/auth/sign-in', { email, password })).status).toBe(200);
    const after = sidOf(client)!;
    expect(after).not.toEqual(before);
    expect((await client.get('/api/studios')).status).toBe(200);
    const replay = new TestClient(h.app);
    replay.setCookie('emberline.sid', before);
    expect((await replay.get('/api/studios')).status).toBe(401);
  });

  test('sign-out destroys the session on the server (security item 5; ASVS 5.0 7.4.1)', async () => {
    const client = new TestClient(h.app);
    await client.signUp();
    const sid = sidOf(client)!;
    expect((await client.post('/api/auth/sign-out')).status).toBe(204);
    const replay = new TestClient(h.app);
    replay.setCookie('emberline.sid', sid);
    expect((await replay.get('/api/studios')).status).toBe(401);
  });

  test('cookies: session HttpOnly + SameSite=Lax with a 30-minute idle expiry (security items 6, 7)', async () => {
    const { email, password } = await new TestClient(h.app).signUp();
    const res = await new TestClient(h.app).post('/api/auth/sign-in', { email, password });
    const session = ([] as string[]).concat(res.headers['set-cookie']).find((c) => c.startsWith('emberline.sid='))!;
    expect(session).toMatch(/HttpOnly/i);
    expect(session).toMatch(/SameSite=Lax/i);
    const expires = Date.parse(session.match(/Expires=([^;]+)/)![1]);
    expect(expires - Date.now()).toBeGreaterThan(29 * 60_000);
    expect(expires - Date.now()).toBeLessThanOrEqual(30 * 60_000 + 1000);
  });

  test('a session older than the 12-hour absolute lifetime is signed out (security item 7; ASVS 4 3.3.2)', async () => {
    const client = new TestClient(h.app);
    await client.signUp();
    expect((await client.get('/api/studios')).status).toBe(200);
    const sid = decodeURIComponent(sidOf(client)!).slice(2).split('.')[0];
    const thirteenHoursAgo = Date.now() - 13 * 3_600_000;
    await h.sequelize.query(
      `UPDATE sessions SET sess = jsonb_set(sess::jsonb, '{signedInAt}', to_jsonb(${thirteenHoursAgo}::bigint))::json WHERE sid = $1`,
      { bind: [sid] },
    );
    // A change made outside the session store shows once its read cache lets go (at most 10 s).
    sessionCache.forget(sid);
    expect((await client.get('/api/studios')).status).toBe(401);
  });
});

describe('password reset by e-mail (real SMTP to the catcher)', () => {
  test('the link works once, then the new password signs in and the old does not', async () => {
    const { email, password } = await new TestClient(h.app).signUp('the first password');
    const since = h.mail.messages.length;
    const ask = await new TestClient(h.app).post('/api/auth/password-reset', { email });
    expect(ask.status).toBe(202);
    const mail = await h.mail.waitFor(email, 5000, since);
    const token = mail.text.match(/reset-password\?token=([A-Za-z0-9_-]+)/)![1];
    expect(token.length).toBeGreaterThanOrEqual(43);
    const confirm = (pw: string) => new TestClient(h.app).post('/api/auth/password-reset/confirm', { token, password: pw });
    expect((await confirm('the second password')).status).toBe(200);
    const reuse = await confirm('a third password!');
    expect(reuse.status).toBe(400);
    expect(reuse.body.error.code).toBe('reset_link_invalid');
    expect((await new TestClient(h.app).post('/api/auth/sign-in', { email, password })).status).toBe(401);
    expect((await new TestClient(h.app).post('/api/auth/sign-in', { email, password: 'the second password' })).status).toBe(200);
  });

  test('an expired link is refused', async () => {
    const { email } = await new TestClient(h.app).signUp();
    const since = h.mail.messages.length;
    await new TestClient(h.app).post('/api/auth/password-reset', { email });
    const token = (await h.mail.waitFor(email, 5000, since)).text.match(/token=([A-Za-z0-9_-]+)/)![1];
    await h.sequelize.query(
      `UPDATE password_resets SET expires_at = now() - interval '1 minute' WHERE user_id = (SELECT id FROM users WHERE email = $1)`,
      { bind: [email] },
    );
    const res = await new TestClient(h.app).post('/api/auth/password-reset/confirm', { token, password: 'whatever works' });
    expect(res.status).toBe(400);
  });

  test('an unknown e-mail gets the same answer and no mail', async () => {
    const since = h.mail.messages.length;
    const ghost = uniqueEmail('ghost');
    const res = await new TestClient(h.app).post('/api/auth/password-reset', { email: ghost });
    expect(res.status).toBe(202);
    await expect(h.mail.waitFor(ghost, 300, since)).rejects.toThrow(/no mail/);
    expect(await User.count({ where: { email: { [Op.eq]: ghost } } })).toBe(0);
  });
});

describe('requests (security items 13, 15, 16)', () => {
  test('a mutation without the CSRF header is refused with 403 and changes nothing', async () => {
    const client = new TestClient(h.app);
    await client.signUp();
    client.sendCsrf = false;
    const res = await client.post('/api/studios', { name: 'Should not exist' });
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('csrf_invalid');
    client.sendCsrf = true;
    const list = await client.get('/api/studios');
    expect(list.body.studios).toEqual([]);
  });

  test('a CSRF token from another session is refused', async () => {
    const a = new TestClient(h.app);
    await a.signUp();
    const b = new TestClient(h.app);
    await b.signUp();
    a.setCookie('XSRF-TOKEN', b.cookie('XSRF-TOKEN')!);
    expect((await a.post('/api/studios', { name: 'x' })).status).toBe(403);
  });

  test('unknown keys and mass-assignment fields are refused (ASVS 5.0 15.3.3)', async () => {
    const client = new TestClient(h.app);
    await client.signUp();
    for (const extra of [{ role: 'owner' }, { studioId: '00000000-0000-4000-8000-000000000000' }, { ownerId: 'x' }]) {
      const res = await client.post('/api/studios', { name: 'Sneaky', ...extra });
      expect(res.status).toBe(400);
      expect(res.body.error.code).toBe('invalid_input');
    }
  });

  test('malformed JSON and oversize bodies get generic JSON errors without a stack', async () => {
    const client = new TestClient(h.app);
    await client.get('/api/auth/me');
    const bad = await client.send('post', '/api/auth/sign-in');
    expect(bad.status).toBe(400);
    const raw = await (
      await import('supertest')
    )
      .default(h.app)
      .post('/api/auth/sign-in')
      .set('content-type', 'application/json')
      .send('{"email":');
    expect(raw.status).toBeGreaterThanOrEqual(400);
    expect(raw.status).toBeLessThan(500);
    expect(JSON.stringify(raw.body)).not.toMatch(/at .*\.ts:\d+/);
    const big = await client.post('/api/auth/sign-in', { email: 'a', password: 'x'.repeat(300_000) });
    expect(big.status).toBe(413);
    expect(big.body.error.code).toBe('body_too_large');
  });

  test('security headers: API answers forbid every script, object and frame (security item 14)', async () => {
    const res = await new TestClient(h.app).get('/api/health');
    const csp: string = res.headers['content-security-policy'];
    const directives = new Map(
      csp
        .split(';')
        .map((d) => d.trim().split(/\s+/))
        .map(([name, ...values]) => [name, values.join(' ')]),
    );
    // No script-src or object-src of its own: both fall back to default-src 'none'.
    expect(directives.get('default-src')).toBe("'none'");
    expect(directives.has('script-src')).toBe(false);
    expect(directives.has('object-src')).toBe(false);
    expect(directives.get('frame-ancestors')).toBe("'none'");
    expect(res.headers['x-content-type-options']).toBe('nosniff');
  });
});

test('a display name change shows in this session and in the account\'s other sessions at once; a bad name is refused with the reason (issue "Workflow", item 26)', async () => {
  const a = new TestClient(h.app);
  const account = await a.signUp('profile password 1', 'profile');
  const b = new TestClient(h.app);
  expect((await b.post('/api/auth/sign-in', { email: account.email, password: 'profile password 1' })).status).toBe(200);
  expect((await b.get('/api/auth/me')).body.user.displayName).not.toBe('Ada Lumen');
  const res = await a.patch('/api/auth/me', { displayName: 'Ada Lumen' });
  expect(res.status).toBe(200);
  expect(res.body.user.displayName).toBe('Ada Lumen');
  expect((await a.get('/api/auth/me')).body.user.displayName).toBe('Ada Lumen');
  expect((await b.get('/api/auth/me')).body.user.displayName).toBe('Ada Lumen');
  expect((await User.findByPk(account.id))!.displayName).toBe('Ada Lumen');
  const bad = await a.patch('/api/auth/me', { displayName: '' });
  expect(bad.status).toBe(400);
  expect(JSON.stringify(bad.body.error)).toContain('displayName');
});

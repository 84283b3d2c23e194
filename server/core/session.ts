import connectPgSimple from 'connect-pg-simple';
import type { RequestHandler, Response, Request } from 'express';
import session from 'express-session';
import type { Pool } from 'pg';
import { csrfSync } from 'csrf-sync';

/** Idle timeout and absolute lifetime of a signed-in session (ASVS 4 3.3.2). */
export const IDLE_TIMEOUT_MS = 30 * 60 * 1000;
export const ABSOLUTE_LIFETIME_MS = 12 * 60 * 60 * 1000;

/** Sessions in PostgreSQL; the cookie is HttpOnly, SameSite=Lax and Secure in production. */
export function sessionMiddleware(pool: Pool, secret: string, production: boolean): RequestHandler {
  return session({
    name: 'emberline.sid',
    store: sessionStore(pool),
    secret,
    resave: false,
    saveUninitialized: false,
    rolling: true,
    cookie: { httpOnly: true, sameSite: 'lax', secure: production, maxAge: IDLE_TIMEOUT_MS, path: '/' },
  });
}

/** A session's stored expiry is pushed forward at most this often (the cookie's on every answer). */
export const TOUCH_EVERY_MS = 60_000;

/** How long a session read from the table may be served from memory before it is read again. */
export const SESSION_CACHE_MS = 10_000;

type StoredSession = session.SessionData;

/**
 * Sessions this process has just read or written, so a burst of requests on one session costs one
 * SELECT rather than one each. Every write and delete this process makes goes through here first;
 * a change made by another process (none today) shows within SESSION_CACHE_MS. An entry is never
 * served past the stored expiry it was read or written with.
 */
class SessionCache {
  private readonly entries = new Map<string, { json: string; userId: string | null; expire: number; until: number }>();
  /** Counts forgets: a read that started before one may have fetched what it removed. */
  private generation = 0;

  constructor(
    private readonly ttlMs: number,
    private readonly max: number,
  ) {}

  read(sid: string, now = Date.now()): StoredSession | undefined {
    const e = this.entries.get(sid);
    if (!e) return undefined;
    if (e.until <= now || e.expire <= now) {
      this.entries.delete(sid);
      return undefined;
    }
    // express-session rewrites the object it is given: each request gets its own copy.
    return JSON.parse(e.json) as StoredSession;
  }

  /** Call before reading the table; pass the result to write. */
  mark(): number {
    return this.generation;
  }

  write(sid: string, sess: StoredSession, expire: number, mark = this.generation, now = Date.now()): void {
    this.entries.delete(sid);
    if (mark !== this.generation) return;
    this.entries.set(sid, { json: JSON.stringify(sess), userId: userIdOf(sess), expire, until: now + this.ttlMs });
    // Oldest first in a Map: keep the memory bounded.
    if (this.entries.size > this.max) this.entries.delete(this.entries.keys().next().value!);
  }

  /** A touch moved the stored expiry forward. */
  extend(sid: string, expire: number): void {
    const e = this.entries.get(sid);
    if (e) e.expire = expire;
  }

  forget(sid: string): void {
    this.generation++;
    this.entries.delete(sid);
  }

  /** Drops every session of an account except `keepSid` (see endSessionsOf). */
  forgetUser(userId: string, keepSid: string | null): void {
    this.generation++;
    for (const [sid, e] of this.entries) if (e.userId === userId && sid !== keepSid) this.entries.delete(sid);
  }
}

/** passport keeps the account at sess.passport.user: an object with the id, or (older rows) the id. */
function userIdOf(sess: StoredSession): string | null {
  const user = (sess as { passport?: { user?: { id?: string } | string } }).passport?.user;
  return (typeof user === 'string' ? user : user?.id) ?? null;
}

/** connect-pg-simple's own rule for a row's expiry: the cookie's, else a day from now. */
function expireOf(sess: StoredSession): number {
  const expires = sess.cookie?.expires;
  return expires ? new Date(expires).getTime() : Date.now() + 86_400_000;
}

export const sessionCache = new SessionCache(SESSION_CACHE_MS, 50_000);

/**
 * connect-pg-simple's store on the sessions table; it prunes expired rows every 15 minutes
 * (security item 35 in the README). With a rolling idle timeout every signed-in request would
 * otherwise write (and flush) an UPDATE: the stored expiry moves at most once a minute, so the
 * 30-minute idle timeout holds to within that minute. Reads go through sessionCache.
 */
export function sessionStore(pool: Pool, prune = true): InstanceType<ReturnType<typeof connectPgSimple>> {
  const PgStore = connectPgSimple(session);
  const store = new PgStore({ pool, tableName: 'sessions', createTableIfMissing: false, pruneSessionInterval: prune ? 15 * 60 : false });
  const touched = new Map<string, number>();
  const [get, set, destroy, touch] = [store.get.bind(store), store.set.bind(store), store.destroy.bind(store), store.touch.bind(store)];
  store.get = (sid, done) => {
    const cached = sessionCache.read(sid);
    if (cached) return done(null, cached);
    const mark = sessionCache.mark();
    get(sid, (err, sess) => {
      if (!err && sess) sessionCache.write(sid, sess, expireOf(sess), mark);
      done(err, sess);
    });
  };
  store.set = (sid, sess, done) => {
    sessionCache.forget(sid);
    const mark = sessionCache.mark();
    set(sid, sess, (err) => {
      if (!err) sessionCache.write(sid, sess, expireOf(sess), mark);
      done?.(err);
    });
  };
  store.destroy = (sid, done) => {
    sessionCache.forget(sid);
    destroy(sid, done);
  };
  store.touch = (sid, sess, done) => {
    const now = Date.now();
    if ((touched.get(sid) ?? 0) > now - TOUCH_EVERY_MS) return done?.();
    touched.delete(sid);
    touched.set(sid, now);
    if (touched.size > 50_000) touched.delete(touched.keys().next().value!);
    touch(sid, sess, () => {
      sessionCache.extend(sid, expireOf(sess));
      done?.();
    });
  };
  return store;
}

/** Ends sessions older than the absolute lifetime, whatever their activity. */
export const absoluteLifetime: RequestHandler = (req, _res, next) => {
  const signedInAt = req.session?.signedInAt;
  if (signedInAt && Date.now() - signedInAt > ABSOLUTE_LIFETIME_MS) {
    // passport's logout regenerates the session: a fresh anonymous one replaces the old.
    req.logout((err) => next(err));
    return;
  }
  next();
};

const csrf = csrfSync({
  getTokenFromRequest: (req) => req.get('x-xsrf-token'),
  errorConfig: { statusCode: 403, code: 'csrf_invalid', message: 'The security token is missing or stale. Reload the page and try again.' },
});

export const CSRF_COOKIE = 'XSRF-TOKEN';

/** Puts the session's CSRF token in the XSRF-TOKEN cookie Angular reads (rotating it if asked). */
export function issueCsrfCookie(req: Request, res: Response, rotate = false): void {
  const token = csrf.generateToken(req, rotate);
  res.locals.csrfToken = token;
  if (rotate || req.cookies?.[CSRF_COOKIE] !== token) {
    res.cookie(CSRF_COOKIE, token, { httpOnly: false, sameSite: 'lax', secure: req.secure, path: '/' });
  }
}

/**
 * Mutations must echo the session's token in X-XSRF-TOKEN (ASVS 5.0 3.5). The token (and so a
 * session row) is made only when asked for — GET /api/auth/csrf before a first form, or at
 * sign-in — never for a plain read (security item 35).
 */
export const csrfProtection: RequestHandler[] = [
  (req, res, next) =>
    csrf.csrfSynchronisedProtection(req, res, (err?: unknown) => {
      if (err) {
        res
          .status(403)
          .json({ error: { code: 'csrf_invalid', message: 'The security token is missing or stale. Reload the page and try again.' } });
        return;
      }
      next();
    }),
];

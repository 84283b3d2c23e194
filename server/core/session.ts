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

/**
 * connect-pg-simple's store on the sessions table; it prunes expired rows every 15 minutes
 * (SECURITY.md 35). With a rolling idle timeout every signed-in request would otherwise write (and
 * flush) an UPDATE: the stored expiry moves at most once a minute, so the 30-minute idle timeout
 * holds to within that minute.
 */
export function sessionStore(pool: Pool, prune = true): InstanceType<ReturnType<typeof connectPgSimple>> {
  const PgStore = connectPgSimple(session);
  const store = new PgStore({ pool, tableName: 'sessions', createTableIfMissing: false, pruneSessionInterval: prune ? 15 * 60 : false });
  const touched = new Map<string, number>();
  const touch = store.touch.bind(store);
  store.touch = (sid, sess, done) => {
    const now = Date.now();
    if ((touched.get(sid) ?? 0) > now - TOUCH_EVERY_MS) return done?.();
    touched.delete(sid);
    touched.set(sid, now);
    // Oldest first in a Map: keep the memory bounded.
    if (touched.size > 50_000) touched.delete(touched.keys().next().value!);
    touch(sid, sess, done);
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
 * sign-in — never for a plain read (SECURITY.md 35).
 */
export const csrfProtection: RequestHandler[] = [
  (req, res, next) =>
    csrf.csrfSynchronisedProtection(req, res, (err?: unknown) => {
      if (err) {
        res.status(403).json({ error: { code: 'csrf_invalid', message: 'The security token is missing or stale. Reload the page and try again.' } });
        return;
      }
      next();
    }),
];

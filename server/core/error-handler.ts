import type { ErrorRequestHandler, RequestHandler } from 'express';
import { AppError } from './app-error';

/** Seconds a client should wait before retrying while the database is away. */
export const OUTAGE_RETRY_AFTER_S = 5;

/** JSON 404 for any /api path no route answered. */
export const apiNotFound: RequestHandler = (req, res) => {
  res.status(404).json({ error: { code: 'not_found', message: `No API route for ${req.method} ${req.path}.` } });
};

/** The body and headers of every "database away" answer (health, routes, the session store). */
export function databaseUnavailable(res: Parameters<RequestHandler>[1]): void {
  res.set('Retry-After', String(OUTAGE_RETRY_AFTER_S));
  res.status(503).json({
    error: {
      code: 'database_unavailable',
      message: 'The database is briefly unavailable. Try again in a few seconds; nothing was changed.',
    },
  });
}

/**
 * The one error middleware: typed app errors keep their status and code; body-parser and multer
 * errors become 4xx; a database outage (from Sequelize, pg or the session store) is 503 with
 * Retry-After; anything else is logged and answered with a generic 500, never a stack.
 */
export const errorHandler: ErrorRequestHandler = (err, req, res, _next) => {
  if (res.headersSent) {
    res.end();
    return;
  }
  if (err instanceof AppError) {
    const retry = (err.details as { retryAfterSeconds?: number } | undefined)?.retryAfterSeconds;
    if (retry) res.set('Retry-After', String(retry));
    res.status(err.status).json({ error: { code: err.code, message: err.message, details: err.details } });
    return;
  }
  if (isDatabaseDown(err)) {
    databaseUnavailable(res);
    return;
  }
  const status = typeof err?.status === 'number' ? err.status : typeof err?.statusCode === 'number' ? err.statusCode : 500;
  if (status >= 400 && status < 500) {
    const code = err.type === 'entity.too.large' ? 'body_too_large' : err.type === 'entity.parse.failed' ? 'bad_json' : 'bad_request';
    const message =
      code === 'body_too_large'
        ? 'The request body is larger than allowed.'
        : code === 'bad_json'
          ? 'The request body is not valid JSON.'
          : 'The request could not be processed.';
    res.status(status).json({ error: { code, message } });
    return;
  }
  if (status === 503) {
    databaseUnavailable(res);
    return;
  }
  console.error(`[error] ${req.method} ${req.originalUrl}:`, err);
  res.status(500).json({ error: { code: 'internal', message: 'Something went wrong on our side. The error was logged.' } });
};

const SEQUELIZE_DOWN = [
  'SequelizeConnectionError',
  'SequelizeConnectionRefusedError',
  'SequelizeConnectionAcquireTimeoutError',
  'SequelizeHostNotReachableError',
  'SequelizeConnectionTimedOutError',
];
/** Socket errors and PostgreSQL's "shutting down / cannot connect now / connection failure" SQLSTATEs. */
const PG_DOWN_CODES = [
  'ECONNREFUSED',
  'ECONNRESET',
  'ETIMEDOUT',
  'EPIPE',
  '57P01',
  '57P02',
  '57P03',
  '08000',
  '08003',
  '08006',
  '08001',
  '08004',
];
const PG_DOWN_MESSAGES =
  /Connection terminated|timeout exceeded when trying to connect|Client has encountered a connection error|the database system is (starting up|shutting down)/i;

/** True for any error that means "PostgreSQL is not reachable right now", whoever raised it. */
export function isDatabaseDown(err: unknown): boolean {
  const e = err as { name?: string; code?: string; message?: string; parent?: unknown; original?: unknown; errors?: unknown[] } | undefined;
  if (!e) return false;
  if (SEQUELIZE_DOWN.includes(e.name ?? '')) return true;
  if (e.code && PG_DOWN_CODES.includes(e.code)) return true;
  if (e.message && PG_DOWN_MESSAGES.test(e.message)) return true;
  // AggregateError (connecting to both 127.0.0.1 and ::1) and Sequelize's wrapped originals.
  if (Array.isArray(e.errors) && e.errors.some(isDatabaseDown)) return true;
  return (
    (e.parent !== undefined && e.parent !== err && isDatabaseDown(e.parent)) ||
    (e.original !== undefined && e.original !== err && isDatabaseDown(e.original))
  );
}

import type { ErrorRequestHandler, RequestHandler } from 'express';
import { AppError } from './app-error';

/** JSON 404 for any /api path no route answered. */
export const apiNotFound: RequestHandler = (req, res) => {
  res.status(404).json({ error: { code: 'not_found', message: `No API route for ${req.method} ${req.path}.` } });
};

/**
 * The one error middleware: typed app errors keep their status and code; body-parser and multer
 * errors become 4xx; anything else is logged and answered with a generic 500, never a stack.
 */
export const errorHandler: ErrorRequestHandler = (err, req, res, _next) => {
  if (res.headersSent) {
    res.end();
    return;
  }
  if (err instanceof AppError) {
    res.status(err.status).json({ error: { code: err.code, message: err.message, details: err.details } });
    return;
  }
  const status = typeof err?.status === 'number' ? err.status : typeof err?.statusCode === 'number' ? err.statusCode : 500;
  if (status >= 400 && status < 500) {
    const code = err.type === 'entity.too.large' ? 'body_too_large' : err.type === 'entity.parse.failed' ? 'bad_json' : 'bad_request';
    const message =
      code === 'body_too_large' ? 'The request body is larger than allowed.' : code === 'bad_json' ? 'The request body is not valid JSON.' : 'The request could not be processed.';
    res.status(status).json({ error: { code, message } });
    return;
  }
  if (status === 503 || isDatabaseDown(err)) {
    res.status(503).json({ error: { code: 'unavailable', message: 'The service is briefly unavailable. Try again in a moment.' } });
    return;
  }
  console.error(`[error] ${req.method} ${req.originalUrl}:`, err);
  res.status(500).json({ error: { code: 'internal', message: 'Something went wrong on our side. The error was logged.' } });
};

function isDatabaseDown(err: unknown): boolean {
  const name = (err as { name?: string })?.name ?? '';
  return ['SequelizeConnectionError', 'SequelizeConnectionRefusedError', 'SequelizeConnectionAcquireTimeoutError', 'SequelizeHostNotReachableError'].includes(name);
}

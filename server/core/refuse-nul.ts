import type { RequestHandler } from 'express';
import { hasNul } from '@shared/api/text.schema';
import { AppError } from './app-error';

/** The dotted path of the first string holding a NUL character, or null. */
export function nulPath(value: unknown, path = ''): string | null {
  if (typeof value === 'string') return hasNul(value) ? path || '(root)' : null;
  if (value && typeof value === 'object') {
    for (const [k, v] of Object.entries(value)) {
      if (hasNul(k)) return path ? `${path}.${k}` : k;
      const found = nulPath(v, path ? `${path}.${k}` : k);
      if (found) return found;
    }
  }
  return null;
}

/** Throws 400 when the body or query holds a NUL character (PostgreSQL text cannot store it). */
export function assertNoNul(value: unknown, where: string): void {
  const path = nulPath(value);
  if (path)
    throw new AppError(400, 'invalid_input', `The ${where} field "${path}" contains a NUL character. Remove it and try again.`, {
      issues: [{ path, message: 'must not contain a NUL character' }],
    });
}

/** Refuses NUL characters anywhere in a JSON body or the query string, before any route runs. */
export const refuseNul: RequestHandler = (req, _res, next) => {
  assertNoNul(req.query, 'query');
  assertNoNul(req.body, 'request body');
  next();
};

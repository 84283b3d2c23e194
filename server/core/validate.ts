import { z } from 'zod';
import { AppError } from './app-error';

/** Formats zod issues as `{ path, message }` with a dotted JSON path. */
export function issuesOf(error: z.ZodError): { path: string; message: string }[] {
  return error.issues.map((issue) => ({
    path: issue.path.length ? issue.path.map(String).join('.') : '(root)',
    message: issue.message,
  }));
}

/** Parses `value` with `schema` or throws a 400 naming every bad field. */
export function parseOrThrow<T extends z.ZodType>(schema: T, value: unknown, what = 'request body'): z.infer<T> {
  const result = schema.safeParse(value);
  if (result.success) return result.data;
  const issues = issuesOf(result.error);
  const first = issues[0];
  throw new AppError(400, 'invalid_input', `The ${what} is not valid: ${first.path}: ${first.message}`, { issues });
}

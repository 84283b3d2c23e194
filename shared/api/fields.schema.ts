import '../model/zod-config';
import { z } from 'zod';

/**
 * Fields that arrive as text (query strings and multipart forms), each refused with a message
 * that names it and says what it takes.
 */

/** A whole number from min to max, written in decimal. */
export function whole(name: string, min: number, max: number) {
  const message = `${name} must be a whole number from ${min} to ${max}`;
  return z.coerce.number({ message }).int({ message }).min(min, { message }).max(max, { message });
}

/** One of a fixed set of words. */
export function oneOf<const T extends readonly [string, ...string[]]>(name: string, options: T) {
  return z.enum(options, { error: (issue) => `${name} must be one of ${options.join(', ')}, got “${String(issue.input).slice(0, 20)}”` });
}

/** Free text to search with, at most max characters. */
export function searchText(max: number) {
  return z.string({ message: 'give the search text once' }).max(max, { message: `the search text must be at most ${max} characters` });
}

import '../model/zod-config';
import { z } from 'zod';

/* eslint-disable no-control-regex -- these patterns exist to find control characters */
/** C0/C1 control characters (NUL, line breaks, escapes) and the Unicode line and paragraph separators. */
const CONTROL = /[\u0000-\u001f\u007f-\u009f\u2028\u2029]/;
const CONTROLS = new RegExp(CONTROL.source, 'g');
/** Control characters other than line breaks (tab, LF and CR are allowed in a note). */
const CONTROL_IN_NOTE = /[\u0000-\u0009\u000b\u000c\u000e-\u001f\u007f]/;
/* eslint-enable no-control-regex */

/** A name taken from elsewhere (a file name, a ROM's own text) with each control character made a space, trimmed. */
export function withoutControls(s: string): string {
  return s.replace(CONTROLS, ' ').trim();
}

/** Something that reads as a web address or a domain (scheme, "www." or name.tld). */
const LINK = /([a-z][a-z0-9+.-]*:\/\/|www\.|\b[a-z0-9-]+\.(com|net|org|io|co|info|biz|app|dev|xyz|ru|cn|de|uk|me|ly|link|site|online)\b)/i;

/**
 * A one-line name typed by a person: trimmed, 1..max characters, no control characters or line
 * breaks (a NUL cannot be stored and a line break in a mail header is an injection).
 */
export function nameSchema(max: number) {
  return z
    .string()
    .trim()
    .min(1, { message: 'is required' })
    .max(max, { message: `must be at most ${max} characters` })
    .refine((s) => !CONTROL.test(s), { message: 'must be one line of text without control characters' });
}

/** A name that also appears in e-mails to other people: no web addresses either (security item 31). */
export function mailedNameSchema(max: number) {
  return nameSchema(max).refine((s) => !LINK.test(s), { message: 'must not contain a web address' });
}

/** Free text of several lines (a revision message): no control characters other than line breaks. */
export function noteSchema(max: number) {
  return z
    .string()
    .trim()
    .max(max, { message: `must be at most ${max} characters` })
    .refine((s) => !CONTROL_IN_NOTE.test(s), { message: 'must not contain control characters' });
}

/** True when a string holds a NUL character, which PostgreSQL text cannot store. */
export const hasNul = (s: string): boolean => s.includes('\u0000');

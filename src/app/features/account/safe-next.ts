/** A same-app path to continue to, or the fallback (never another origin, never `//host`). */
export function safeNext(next: string | undefined, fallback: string): string {
  return next && next.startsWith('/') && !next.startsWith('//') ? next : fallback;
}

import { HttpClient, HttpErrorResponse, type HttpInterceptorFn } from '@angular/common/http';
import { inject } from '@angular/core';
import { catchError, from, switchMap, throwError } from 'rxjs';

const SAFE = new Set(['GET', 'HEAD', 'OPTIONS']);
const readCookie = (name: string): string | null =>
  document.cookie
    .split('; ')
    .find((c) => c.startsWith(`${name}=`))
    ?.slice(name.length + 1) ?? null;

/** One request for a token at a time, shared by every mutation that needs it. */
let pending: Promise<string> | null = null;

function freshToken(http: HttpClient): Promise<string> {
  pending ??= new Promise<string>((resolve, reject) =>
    http.get<{ token: string }>('/api/auth/csrf').subscribe({ next: (r) => resolve(r.token), error: reject }),
  ).finally(() => (pending = null));
  return pending;
}

const isStaleToken = (err: unknown) => err instanceof HttpErrorResponse && err.status === 403 && err.error?.error?.code === 'csrf_invalid';

/**
 * The server makes a CSRF token (and so a session) only when asked: before the first mutation of
 * a visit this fetches one from /api/auth/csrf, then sends it as X-XSRF-TOKEN, as the server's
 * csrf-sync check expects. Reads never create a session.
 */
export const csrfInterceptor: HttpInterceptorFn = (req, next) => {
  if (SAFE.has(req.method) || !req.url.startsWith('/api/') || req.url === '/api/auth/csrf') return next(req);
  const http = inject(HttpClient);
  const withToken = (token: string) => next(req.clone({ setHeaders: { 'X-XSRF-TOKEN': token } }));
  const existing = readCookie('XSRF-TOKEN');
  const first = existing ? withToken(decodeURIComponent(existing)) : from(freshToken(http)).pipe(switchMap(withToken));
  // A token whose session ended (idle timeout, sign-out elsewhere) is replaced once, then the call is retried.
  return first.pipe(
    catchError((err) => (existing && isStaleToken(err) ? from(freshToken(http)).pipe(switchMap(withToken)) : throwError(() => err))),
  );
};

import { HttpErrorResponse } from '@angular/common/http';
import type { ApiErrorBody } from '@shared/api/dto';

/** A readable sentence for a failed API call: the server's message, or what the status means. */
export function apiErrorMessage(err: unknown): string {
  if (err instanceof HttpErrorResponse) {
    const body = err.error as Partial<ApiErrorBody> | null;
    if (body?.error?.message) return body.error.message;
    if (err.status === 0) return 'The server cannot be reached. Check the connection and try again.';
    if (err.status === 503) return 'The service is briefly unavailable. Try again in a moment.';
    return `The request failed (${err.status} ${err.statusText}).`;
  }
  return err instanceof Error ? err.message : 'Something went wrong.';
}

/** The machine-readable code of a failed API call, when the server sent one. */
export function apiErrorCode(err: unknown): string | undefined {
  return err instanceof HttpErrorResponse ? (err.error as Partial<ApiErrorBody> | null)?.error?.code : undefined;
}

/** A failure with an HTTP status and a stable machine-readable code; thrown by services. */
export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
    this.name = 'AppError';
  }
}

export const notFound = (what: string) => new AppError(404, 'not_found', `${what} was not found.`);
export const forbidden = (message = 'Your role in this studio does not allow that.') => new AppError(403, 'forbidden', message);
export const unauthenticated = () => new AppError(401, 'unauthenticated', 'Sign in to continue.');
export const conflict = (code: string, message: string, details?: unknown) => new AppError(409, code, message, details);

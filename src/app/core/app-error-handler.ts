import { ErrorHandler, inject, Injectable, NgZone } from '@angular/core';
import { MatSnackBar } from '@angular/material/snack-bar';
import { apiErrorMessage } from './api-error';

/** The one client error handler: every uncaught error is logged and shown in a snackbar. */
@Injectable()
export class AppErrorHandler implements ErrorHandler {
  private readonly snackBar = inject(MatSnackBar);
  private readonly zone = inject(NgZone);

  handleError(error: unknown): void {
    console.error(error);
    const message = apiErrorMessage((error as { rejection?: unknown })?.rejection ?? error);
    this.zone.run(() => this.snackBar.open(message, 'Dismiss', { duration: 8000, politeness: 'assertive' }));
  }
}

import { ErrorHandler, inject, Injectable } from '@angular/core';
import { MatSnackBar } from '@angular/material/snack-bar';
import { apiErrorMessage } from './api-error';

/** The one client error handler: every uncaught error is logged and shown in a snackbar. */
@Injectable()
export class AppErrorHandler implements ErrorHandler {
  private readonly snackBar = inject(MatSnackBar);

  handleError(error: unknown): void {
    console.error(error);
    const message = apiErrorMessage((error as { rejection?: unknown })?.rejection ?? error);
    // Zoneless: signals drive change detection, so no zone.run is needed.
    this.snackBar.open(message, 'Dismiss', { duration: 8000, politeness: 'assertive' });
  }
}

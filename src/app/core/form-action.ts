import { signal } from '@angular/core';
import type { AbstractControl } from '@angular/forms';
import { apiErrorMessage } from './api-error';

/** A form's submit: refused with field errors while invalid, busy while it runs, the server's message if it fails. */
export class FormAction {
  readonly busy = signal(false);
  readonly error = signal('');

  async run(form: AbstractControl, action: () => Promise<void>): Promise<void> {
    if (form.invalid) {
      form.markAllAsTouched();
      return;
    }
    this.busy.set(true);
    this.error.set('');
    try {
      await action();
    } catch (err) {
      this.error.set(apiErrorMessage(err));
    } finally {
      this.busy.set(false);
    }
  }
}

import { HttpClient } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { FormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { RouterLink } from '@angular/router';
import { firstValueFrom } from 'rxjs';
import { apiErrorMessage } from '../../core/api-error';
import { AccountFrame } from './account-frame';

/** Ask for a password reset link by e-mail. */
@Component({
  selector: 'em-forgot-password',
  imports: [AccountFrame, ReactiveFormsModule, RouterLink, MatButtonModule, MatFormFieldModule, MatInputModule],
  template: `
    <em-account-frame heading="Reset your password" lead="We e-mail you a link that works once, for an hour.">
      <form [formGroup]="form" (ngSubmit)="sendLink()" novalidate>
        <mat-form-field appearance="outline">
          <mat-label>E-mail</mat-label>
          <input matInput type="email" formControlName="email" autocomplete="email" required />
          @if (form.controls.email.hasError('required')) {
            <mat-error>Enter your e-mail address.</mat-error>
          } @else if (form.controls.email.hasError('email')) {
            <mat-error>That is not an e-mail address.</mat-error>
          }
        </mat-form-field>
        <p class="error" role="alert">{{ error() }}</p>
        <p class="ok" role="status">{{ sent() }}</p>
        <div class="actions">
          <button mat-flat-button type="submit" [disabled]="busy()">Send reset link</button>
        </div>
      </form>
      <p class="links"><a routerLink="/sign-in">Back to sign in</a></p>
    </em-account-frame>
  `,
  styleUrl: './account-form.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ForgotPassword {
  private readonly http = inject(HttpClient);

  protected readonly form = inject(FormBuilder).nonNullable.group({ email: ['', [Validators.required, Validators.email]] });
  protected readonly busy = signal(false);
  protected readonly error = signal('');
  protected readonly sent = signal('');

  protected async sendLink(): Promise<void> {
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.busy.set(true);
    this.error.set('');
    try {
      const { message } = await firstValueFrom(this.http.post<{ message: string }>('/api/auth/password-reset', this.form.getRawValue()));
      this.sent.set(message);
    } catch (err) {
      this.error.set(apiErrorMessage(err));
    } finally {
      this.busy.set(false);
    }
  }
}

import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { FormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { RouterLink } from '@angular/router';
import { FormAction } from '../../core/form-action';
import { AccountFrame } from './account-frame';
import { AuthStore } from '../../core/auth-store';

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
        <p class="error" role="alert">{{ submit.error() }}</p>
        <p class="ok" role="status">{{ sent() }}</p>
        <div class="actions">
          <button mat-flat-button type="submit" [disabled]="submit.busy()">Send reset link</button>
        </div>
      </form>
      <p class="links"><a routerLink="/sign-in">Back to sign in</a></p>
    </em-account-frame>
  `,
  styleUrl: './account-form.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ForgotPassword {
  private readonly auth = inject(AuthStore);

  protected readonly form = inject(FormBuilder).nonNullable.group({ email: ['', [Validators.required, Validators.email]] });
  protected readonly submit = new FormAction();
  protected readonly sent = signal('');

  protected sendLink(): Promise<void> {
    return this.submit.run(this.form, async () => {
      this.sent.set(await this.auth.requestPasswordReset(this.form.getRawValue().email));
    });
  }
}

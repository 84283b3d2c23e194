import { ChangeDetectionStrategy, Component, inject, input, resource, signal } from '@angular/core';
import { FormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { apiErrorMessage } from '../../core/api-error';
import { RouterLink } from '@angular/router';
import { FormAction } from '../../core/form-action';
import { AccountFrame } from './account-frame';
import { passwordLength } from './password-length';
import { AuthStore } from '../../core/auth-store';

/** Choose a new password with the token from the e-mailed link. */
@Component({
  selector: 'em-reset-password',
  imports: [AccountFrame, ReactiveFormsModule, RouterLink, MatButtonModule, MatFormFieldModule, MatInputModule, MatProgressBarModule],
  template: `
    <em-account-frame heading="Choose a new password">
      @if (!token()) {
        <p class="error" role="alert">
          This page needs the link from the reset e-mail. <a routerLink="/forgot-password">Ask for a new link</a>.
        </p>
      } @else if (done()) {
        <p class="ok" role="status">{{ done() }}</p>
        <a mat-flat-button routerLink="/sign-in">Sign in</a>
      } @else if (link.isLoading()) {
        <mat-progress-bar mode="indeterminate" aria-label="Checking the link" />
      } @else if (link.error()) {
        <p class="error" role="alert">{{ linkError() }}</p>
        <div class="actions">
          <a mat-flat-button routerLink="/forgot-password">Ask for a new link</a>
          <a mat-stroked-button routerLink="/sign-in">Sign in</a>
        </div>
      } @else {
        <form [formGroup]="form" (ngSubmit)="setPassword()" novalidate>
          <mat-form-field appearance="outline">
            <mat-label>New password</mat-label>
            <input matInput type="password" formControlName="password" autocomplete="new-password" required />
            <mat-hint>8 to 128 characters.</mat-hint>
            @if (form.controls.password.hasError('required')) {
              <mat-error>Choose a password.</mat-error>
            } @else if (form.controls.password.hasError('passwordLength')) {
              <mat-error>{{ form.controls.password.getError('passwordLength') }}</mat-error>
            }
          </mat-form-field>
          <p class="error" role="alert">{{ submit.error() }}</p>
          <div class="actions">
            <button mat-flat-button type="submit" [disabled]="submit.busy()">Set password</button>
          </div>
        </form>
      }
    </em-account-frame>
  `,
  styleUrl: './account-form.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ResetPassword {
  private readonly auth = inject(AuthStore);

  readonly token = input<string>('');

  protected readonly form = inject(FormBuilder).nonNullable.group({ password: ['', [Validators.required, passwordLength]] });
  protected readonly submit = new FormAction();
  protected readonly done = signal('');
  /** Whether the link still works, asked before a password is typed (a used link says so at once). */
  protected readonly link = resource({
    params: () => this.token() || undefined,
    loader: ({ params }) => this.auth.passwordResetLink(params),
  });

  protected linkError(): string {
    return apiErrorMessage(this.link.error());
  }

  protected setPassword(): Promise<void> {
    return this.submit.run(this.form, async () => {
      this.done.set(await this.auth.confirmPasswordReset(this.token(), this.form.getRawValue().password));
    });
  }
}

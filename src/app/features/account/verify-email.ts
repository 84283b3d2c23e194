import { ChangeDetectionStrategy, Component, inject, input, signal, type OnInit } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { Router, RouterLink } from '@angular/router';
import { apiErrorMessage } from '../../core/api-error';
import { AuthStore } from '../../core/auth-store';
import { AccountFrame } from './account-frame';

/** The page a verification mail links to: opens the link once, then goes on to the studios. */
@Component({
  selector: 'em-verify-email',
  imports: [AccountFrame, RouterLink, MatButtonModule, MatProgressBarModule],
  template: `
    <em-account-frame heading="Confirm your address">
      @if (!token()) {
        <p class="error" role="alert">
          This page needs the link from the confirmation e-mail. <a routerLink="/sign-up">Sign up again</a> for a new one.
        </p>
      } @else if (error()) {
        <p class="error" role="alert">{{ error() }}</p>
        <div class="actions">
          <a mat-flat-button routerLink="/sign-in">Sign in</a>
          <a mat-stroked-button routerLink="/sign-up">Sign up again</a>
        </div>
      } @else {
        <p role="status">Confirming your address…</p>
        <mat-progress-bar mode="indeterminate" aria-label="Confirming your address" />
      }
    </em-account-frame>
  `,
  styleUrl: './account-form.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class VerifyEmail implements OnInit {
  private readonly auth = inject(AuthStore);
  private readonly router = inject(Router);

  readonly token = input<string>('');

  protected readonly error = signal('');

  async ngOnInit(): Promise<void> {
    if (!this.token()) return;
    try {
      await this.auth.verifyEmail(this.token());
      await this.router.navigateByUrl('/studios');
    } catch (err) {
      this.error.set(apiErrorMessage(err));
    }
  }
}

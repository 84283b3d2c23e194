import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal } from '@angular/core';
import { FormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { Router, RouterLink } from '@angular/router';
import { FormAction } from '../../core/form-action';
import { AuthStore } from '../../core/auth-store';
import { StudioApi } from '../studio/studio-api';
import { AccountFrame } from './account-frame';
import { safeNext } from './safe-next';
import { passwordLength } from './password-length';

/**
 * Create an account. The address is proven by a mailed link before the account exists; arriving
 * from an invite link (next=/invites/<token>) proves it already, so the account is made at once.
 */
@Component({
  selector: 'em-sign-up',
  imports: [AccountFrame, ReactiveFormsModule, RouterLink, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule],
  templateUrl: './sign-up.html',
  styleUrl: './account-form.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SignUp {
  private readonly auth = inject(AuthStore);
  private readonly router = inject(Router);
  private readonly studios = inject(StudioApi);

  /** Where to go after success (a path inside the app); from the query string. */
  readonly next = input<string | undefined>();

  protected readonly form = inject(FormBuilder).nonNullable.group({
    displayName: ['', [Validators.required, Validators.maxLength(80)]],
    email: ['', [Validators.required, Validators.email]],
    password: ['', [Validators.required, passwordLength]],
  });
  protected readonly submit = new FormAction();
  /** The "check your inbox" message once the sign-up is sent. */
  protected readonly sent = signal('');
  protected readonly sentTo = signal('');
  private readonly inviteToken = computed(() => this.next()?.match(/^\/invites\/([A-Za-z0-9_-]{20,100})$/)?.[1]);

  constructor() {
    // Arriving from an invite: the invited address is the one to sign up with.
    effect(() => {
      const token = this.inviteToken();
      if (!token) return;
      this.studios.previewInvite(token).then(
        (invite) => {
          if (!invite.accepted && !this.form.controls.email.dirty) this.form.controls.email.setValue(invite.email);
        },
        () => undefined,
      );
    });
  }

  protected createAccount(): Promise<void> {
    return this.submit.run(this.form, async () => {
      const { displayName, email, password } = this.form.getRawValue();
      const message = await this.auth.signUp(displayName, email, password, this.inviteToken());
      if (message === null) {
        await this.router.navigateByUrl(safeNext(this.next(), '/studios'));
        return;
      }
      this.sentTo.set(email.trim().toLowerCase());
      this.sent.set(message);
    });
  }

  protected startOver(): void {
    this.sent.set('');
    this.form.controls.password.reset('');
  }
}

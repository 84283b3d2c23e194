import { ChangeDetectionStrategy, Component, inject, input } from '@angular/core';
import { FormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatProgressSpinnerModule } from '@angular/material/progress-spinner';
import { Router, RouterLink } from '@angular/router';
import { FormAction } from '../../core/form-action';
import { AuthStore } from '../../core/auth-store';
import { AccountFrame } from './account-frame';
import { safeNext } from './safe-next';

/** Sign in with e-mail and password; returns to `next` afterwards. */
@Component({
  selector: 'em-sign-in',
  imports: [AccountFrame, ReactiveFormsModule, RouterLink, MatButtonModule, MatFormFieldModule, MatInputModule, MatProgressSpinnerModule],
  templateUrl: './sign-in.html',
  styleUrl: './account-form.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SignIn {
  private readonly auth = inject(AuthStore);
  private readonly router = inject(Router);

  /** Where to go after success (a path inside the app); from the query string. */
  readonly next = input<string | undefined>();

  protected readonly form = inject(FormBuilder).nonNullable.group({
    email: ['', [Validators.required, Validators.email]],
    password: ['', Validators.required],
  });
  protected readonly submit = new FormAction();

  protected signIn(): Promise<void> {
    return this.submit.run(this.form, async () => {
      const { email, password } = this.form.getRawValue();
      await this.auth.signIn(email, password);
      await this.router.navigateByUrl(safeNext(this.next(), '/'));
    });
  }
}

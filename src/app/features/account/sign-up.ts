import { ChangeDetectionStrategy, Component, inject, input } from '@angular/core';
import { FormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { Router, RouterLink } from '@angular/router';
import { FormAction } from '../../core/form-action';
import { AuthStore } from '../../core/auth-store';
import { AccountFrame } from './account-frame';
import { safeNext } from './safe-next';
import { passwordLength } from './password-length';

/** Create an account; the new user is signed in and lands on the studio list. */
@Component({
  selector: 'em-sign-up',
  imports: [AccountFrame, ReactiveFormsModule, RouterLink, MatButtonModule, MatFormFieldModule, MatInputModule],
  templateUrl: './sign-up.html',
  styleUrl: './account-form.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SignUp {
  private readonly auth = inject(AuthStore);
  private readonly router = inject(Router);

  /** Where to go after success (a path inside the app); from the query string. */
  readonly next = input<string | undefined>();

  protected readonly form = inject(FormBuilder).nonNullable.group({
    displayName: ['', [Validators.required, Validators.maxLength(80)]],
    email: ['', [Validators.required, Validators.email]],
    password: ['', [Validators.required, passwordLength]],
  });
  protected readonly submit = new FormAction();

  protected createAccount(): Promise<void> {
    return this.submit.run(this.form, async () => {
      const { displayName, email, password } = this.form.getRawValue();
      await this.auth.signUp(displayName, email, password);
      await this.router.navigateByUrl(safeNext(this.next(), '/studios'));
    });
  }
}

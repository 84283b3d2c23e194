import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { FormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { RouterLink } from '@angular/router';
import { AuthStore } from '../../core/auth-store';
import { FormAction } from '../../core/form-action';
import { AccountFrame } from './account-frame';

/** The signed-in account: display name, and a password change that signs out its other sessions. */
@Component({
  selector: 'em-account-settings',
  imports: [AccountFrame, ReactiveFormsModule, RouterLink, MatButtonModule, MatFormFieldModule, MatInputModule],
  template: `
    <em-account-frame heading="Your account" [lead]="'Signed in as ' + (auth.user()?.email ?? '')">
      <form [formGroup]="profile" (ngSubmit)="saveName()" novalidate aria-labelledby="profile-title">
        <h2 id="profile-title">Profile</h2>
        <mat-form-field appearance="outline">
          <mat-label>Display name</mat-label>
          <input matInput formControlName="displayName" autocomplete="name" required />
          <mat-hint>Studio members see it beside your changes.</mat-hint>
          @if (profile.controls.displayName.hasError('required')) {
            <mat-error>Enter a name.</mat-error>
          }
        </mat-form-field>
        <p class="error" role="alert">{{ nameAction.error() }}</p>
        <p class="ok" role="status">{{ nameSaved() }}</p>
        <div class="actions"><button mat-flat-button type="submit" [disabled]="nameAction.busy()">Save name</button></div>
      </form>

      <form [formGroup]="password" (ngSubmit)="savePassword()" novalidate aria-labelledby="password-title">
        <h2 id="password-title">Password</h2>
        <mat-form-field appearance="outline">
          <mat-label>Current password</mat-label>
          <input matInput type="password" formControlName="currentPassword" autocomplete="current-password" required />
          @if (password.controls.currentPassword.hasError('required')) {
            <mat-error>Enter your current password.</mat-error>
          }
        </mat-form-field>
        <mat-form-field appearance="outline">
          <mat-label>New password</mat-label>
          <input matInput type="password" formControlName="newPassword" autocomplete="new-password" required />
          <mat-hint>8 to 128 characters; a few words make a good one.</mat-hint>
          @if (password.controls.newPassword.hasError('required')) {
            <mat-error>Enter a new password.</mat-error>
          } @else if (password.controls.newPassword.hasError('minlength')) {
            <mat-error>Use at least 8 characters.</mat-error>
          }
        </mat-form-field>
        <p class="error" role="alert">{{ passwordAction.error() }}</p>
        <p class="ok" role="status">{{ passwordSaved() }}</p>
        <div class="actions"><button mat-flat-button type="submit" [disabled]="passwordAction.busy()">Change password</button></div>
        <p class="note">Changing it signs you out everywhere else.</p>
      </form>
      <p class="links"><a routerLink="/studios">Back to your studios</a></p>
    </em-account-frame>
  `,
  styleUrl: './account-form.scss',
  styles: `
    form + form {
      margin-top: 24px;
      padding-top: 16px;
      border-top: 1px solid var(--mat-sys-outline-variant);
    }
    h2 {
      font: var(--mat-sys-title-medium);
      margin: 0 0 12px;
    }
    .note {
      color: var(--mat-sys-on-surface-variant);
      font: var(--mat-sys-body-small);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AccountSettings {
  protected readonly auth = inject(AuthStore);
  private readonly fb = inject(FormBuilder).nonNullable;

  protected readonly profile = this.fb.group({
    displayName: [this.auth.user()?.displayName ?? '', [Validators.required, Validators.maxLength(80)]],
  });
  protected readonly password = this.fb.group({
    currentPassword: ['', Validators.required],
    newPassword: ['', [Validators.required, Validators.minLength(8), Validators.maxLength(128)]],
  });
  protected readonly nameAction = new FormAction();
  protected readonly passwordAction = new FormAction();
  protected readonly nameSaved = signal('');
  protected readonly passwordSaved = signal('');

  protected saveName(): Promise<void> {
    this.nameSaved.set('');
    return this.nameAction.run(this.profile, async () => {
      await this.auth.rename(this.profile.getRawValue().displayName.trim());
      this.nameSaved.set('Name saved.');
    });
  }

  protected savePassword(): Promise<void> {
    this.passwordSaved.set('');
    return this.passwordAction.run(this.password, async () => {
      const { currentPassword, newPassword } = this.password.getRawValue();
      this.passwordSaved.set(await this.auth.changePassword(currentPassword, newPassword));
      this.password.reset();
    });
  }
}

import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { FormBuilder, FormControl, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { Router, RouterLink } from '@angular/router';
import { FormAction } from '../../core/form-action';
import { AuthStore } from '../../core/auth-store';
import { StudioApi } from './studio-api';

/** The caller's studios, and a form to start a new one. */
@Component({
  selector: 'em-studio-list',
  imports: [ReactiveFormsModule, RouterLink, MatButtonModule, MatFormFieldModule, MatInputModule, MatIconModule],
  templateUrl: './studio-list.html',
  styleUrl: './studio-list.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StudioList {
  private readonly api = inject(StudioApi);
  private readonly router = inject(Router);
  protected readonly auth = inject(AuthStore);

  protected readonly form = inject(FormBuilder).nonNullable.group({ name: ['', [Validators.required, Validators.maxLength(80)]] });
  protected readonly submit = new FormAction();
  protected readonly resend = new FormAction();
  protected readonly resent = signal('');

  constructor() {
    void this.auth.refreshStudios();
  }

  protected createStudio(): Promise<void> {
    return this.submit.run(this.form, async () => {
      const studio = await this.api.create(this.form.getRawValue().name);
      await this.auth.refreshStudios();
      await this.router.navigate(['/studios', studio.id, 'bench']);
    });
  }

  protected resendLink(): Promise<void> {
    // A button without fields: an always-valid control stands in for the form.
    return this.resend.run(new FormControl(null), async () => this.resent.set(await this.auth.resendVerification()));
  }

  protected async signOut(): Promise<void> {
    await this.auth.signOut();
    await this.router.navigateByUrl('/sign-in');
  }
}

import { ChangeDetectionStrategy, Component, inject, input, resource, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { Router, RouterLink } from '@angular/router';
import { apiErrorMessage } from '../../core/api-error';
import { AuthStore } from '../../core/auth-store';
import { AccountFrame } from '../account/account-frame';
import { StudioApi } from './studio-api';

/** The page an invite e-mail links to: shows the offer, then accepts it for the signed-in user. */
@Component({
  selector: 'em-invite-accept',
  imports: [AccountFrame, RouterLink, MatButtonModule, MatProgressBarModule],
  templateUrl: './invite-accept.html',
  styleUrl: '../account/account-form.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class InviteAccept {
  private readonly api = inject(StudioApi);
  private readonly router = inject(Router);
  protected readonly auth = inject(AuthStore);

  readonly token = input.required<string>();

  protected readonly invite = resource({ params: () => this.token(), loader: ({ params }) => this.api.previewInvite(params) });
  protected readonly busy = signal(false);
  protected readonly error = signal('');

  protected here(): string {
    return `/invites/${this.token()}`;
  }

  protected loadError(): string {
    return apiErrorMessage(this.invite.error());
  }

  protected async accept(): Promise<void> {
    this.busy.set(true);
    this.error.set('');
    try {
      const studio = await this.api.acceptInvite(this.token());
      await this.auth.refreshStudios();
      await this.router.navigate(['/studios', studio.id, 'bench']);
    } catch (err) {
      this.error.set(apiErrorMessage(err));
    } finally {
      this.busy.set(false);
    }
  }
}

import { ChangeDetectionStrategy, Component, computed, inject, linkedSignal, resource, signal } from '@angular/core';
import { FormBuilder, FormsModule, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatTableModule } from '@angular/material/table';
import { MatTooltipModule } from '@angular/material/tooltip';
import { DatePipe } from '@angular/common';
import { Router } from '@angular/router';
import type { MemberDto } from '@shared/api/dto';
import { ROLE_LABELS, ROLES, roleInSentence, type Role } from '@shared/model/roles';
import { apiErrorMessage } from '../../core/api-error';
import { AuthStore } from '../../core/auth-store';
import { Confirm } from '../../shared/confirm-dialog';
import { StudioApi } from './studio-api';
import { StudioContext } from './studio-context';

/** Members and pending invites of the open studio; owners invite, change roles and remove. */
@Component({
  selector: 'em-members',
  imports: [
    ReactiveFormsModule,
    FormsModule,
    DatePipe,
    MatTableModule,
    MatSelectModule,
    MatButtonModule,
    MatIconModule,
    MatFormFieldModule,
    MatInputModule,
    MatProgressBarModule,
    MatTooltipModule,
  ],
  templateUrl: './members.html',
  styleUrl: './members.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Members {
  private readonly api = inject(StudioApi);
  private readonly snackBar = inject(MatSnackBar);
  private readonly router = inject(Router);
  private readonly auth = inject(AuthStore);
  private readonly confirm = inject(Confirm);
  protected readonly context = inject(StudioContext);

  protected readonly roles = ROLES;
  protected readonly roleLabels = ROLE_LABELS;
  protected readonly me = computed(() => this.auth.user()?.id);
  protected readonly members = resource({ params: () => this.context.studioId(), loader: ({ params }) => this.api.members(params) });
  protected readonly invites = resource({
    params: () => (this.context.canManage() ? this.context.studioId() : undefined),
    loader: ({ params }) => this.api.invites(params),
  });
  protected readonly memberColumns = computed(() =>
    this.context.canManage() ? ['name', 'email', 'role', 'joined', 'actions'] : ['name', 'email', 'role', 'joined'],
  );
  protected readonly inviteForm = inject(FormBuilder).nonNullable.group({
    email: ['', [Validators.required, Validators.email]],
    role: ['viewer' as Role, Validators.required],
  });
  protected readonly inviting = signal(false);
  protected readonly inviteError = signal('');

  protected async sendInvite(): Promise<void> {
    if (this.inviteForm.invalid) {
      this.inviteForm.markAllAsTouched();
      return;
    }
    this.inviting.set(true);
    this.inviteError.set('');
    try {
      const { email, role } = this.inviteForm.getRawValue();
      await this.api.invite(this.context.studioId(), email, role);
      this.inviteForm.reset({ email: '', role: 'viewer' });
      this.snackBar.open(`Invite sent to ${email}.`, undefined, { duration: 4000 });
      this.invites.reload();
    } catch (err) {
      this.inviteError.set(apiErrorMessage(err));
    } finally {
      this.inviting.set(false);
    }
  }

  protected async changeRole(member: MemberDto, role: Role): Promise<void> {
    await this.act(
      () => this.api.changeRole(this.context.studioId(), member.userId, role),
      `${member.displayName} is now ${roleInSentence(role)}.`,
    );
  }

  protected async removeMember(member: MemberDto): Promise<void> {
    const confirmed = await this.confirm.ask({
      title: `Remove ${member.displayName}?`,
      consequences: [
        `${member.displayName} loses access to ${this.context.studio()?.name ?? 'the studio'} at once: its artworks, presets and timings.`,
        'What they made stays in the studio.',
        'To bring them back, invite them again.',
      ],
      action: 'Remove member',
    });
    if (!confirmed) return;
    await this.act(() => this.api.removeMember(this.context.studioId(), member.userId), `${member.displayName} was removed.`);
  }

  protected readonly studioName = linkedSignal(() => this.context.studio()?.name ?? '');

  protected async renameStudio(): Promise<void> {
    const name = this.studioName().trim();
    try {
      const studio = await this.api.rename(this.context.studioId(), name);
      this.context.studio.set(studio);
      await this.auth.refreshStudios();
      this.snackBar.open(`The studio is now called “${studio.name}”.`, undefined, { duration: 4000 });
    } catch (err) {
      this.snackBar.open(apiErrorMessage(err), 'Dismiss', { duration: 8000 });
    }
  }

  protected async deleteStudio(): Promise<void> {
    const studio = this.context.studio();
    if (!studio) return;
    const confirmed = await this.confirm.ask({
      title: `Delete ${studio.name}?`,
      consequences: [
        'Every artwork, preset (with its history), saved timing and render in it is deleted.',
        'Its share links stop working at once.',
        'Every member loses access.',
        'This cannot be undone.',
      ],
      action: 'Delete studio',
    });
    if (!confirmed) return;
    try {
      await this.api.remove(studio.id);
      await this.auth.refreshStudios();
      await this.router.navigateByUrl('/studios');
      this.snackBar.open(`Deleted ${studio.name}.`, undefined, { duration: 4000 });
    } catch (err) {
      this.snackBar.open(apiErrorMessage(err), 'Dismiss', { duration: 8000 });
    }
  }

  protected async revokeInvite(inviteId: string): Promise<void> {
    await this.act(() => this.api.revokeInvite(this.context.studioId(), inviteId), 'Invite revoked.');
    this.invites.reload();
  }

  protected async leaveStudio(): Promise<void> {
    const me = this.me();
    if (!me) return;
    const studio = this.context.studio()?.name ?? 'the studio';
    const confirmed = await this.confirm.ask({
      title: `Leave ${studio}?`,
      consequences: [
        `You lose access to ${studio} at once.`,
        'What you made stays in the studio.',
        'To come back, an owner must invite you again.',
      ],
      action: 'Leave studio',
    });
    if (!confirmed) return;
    try {
      await this.api.removeMember(this.context.studioId(), me);
      await this.auth.refreshStudios();
      await this.router.navigateByUrl('/studios');
    } catch (err) {
      this.snackBar.open(apiErrorMessage(err), 'Dismiss', { duration: 8000 });
    }
  }

  private async act(action: () => Promise<unknown>, done: string): Promise<void> {
    try {
      await action();
      this.snackBar.open(done, undefined, { duration: 4000 });
    } catch (err) {
      this.snackBar.open(apiErrorMessage(err), 'Dismiss', { duration: 8000 });
    }
    this.members.reload();
  }
}

import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, input, linkedSignal, resource, signal } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatTooltipModule } from '@angular/material/tooltip';
import { Router, RouterLink } from '@angular/router';
import type { PresetRevisionDto } from '@shared/api/dto';
import { changeLabel, describeChange, describeValue, paramDiff, type ParamChange } from '@shared/model/param-diff';
import { panelTypeById } from '@shared/model/panel-types';
import { apiErrorMessage } from '../../core/api-error';
import { Confirm } from '../../shared/confirm-dialog';
import { AuthStore } from '../../core/auth-store';
import { ArtworkApi } from '../artworks/artwork-api';
import { downloadText } from '../drive/download';
import { StudioContext } from '../studio/studio-context';
import { PresetApi } from './preset-api';
import { RenderThumb } from './render-thumb';

/** One preset: its history (compare two revisions, restore one), sharing and housekeeping. */
@Component({
  selector: 'em-preset-detail',
  imports: [
    FormsModule,
    RouterLink,
    DatePipe,
    MatButtonModule,
    MatIconModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatProgressBarModule,
    MatTooltipModule,
    RenderThumb,
  ],
  templateUrl: './preset-detail.html',
  styleUrl: './preset-detail.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PresetDetail {
  private readonly api = inject(PresetApi);
  private readonly artworksApi = inject(ArtworkApi);
  private readonly snackBar = inject(MatSnackBar);
  private readonly router = inject(Router);
  private readonly confirm = inject(Confirm);
  protected readonly auth = inject(AuthStore);
  protected readonly context = inject(StudioContext);

  readonly presetId = input.required<string>();

  protected readonly preset = resource({
    params: () => ({ s: this.context.studioId(), id: this.presetId() }),
    loader: ({ params }) => this.api.get(params.s, params.id),
  });
  protected readonly revisions = resource({
    params: () => ({ s: this.context.studioId(), id: this.presetId(), rev: this.preset.hasValue() ? this.preset.value().revision : 0 }),
    loader: ({ params }) => this.api.revisions(params.s, params.id),
  });
  protected readonly links = resource({
    params: () => (this.context.canManage() ? { s: this.context.studioId(), id: this.presetId() } : undefined),
    loader: ({ params }) => this.api.links(params.s, params.id),
  });
  protected readonly artworks = resource({ params: () => this.context.studioId(), loader: ({ params }) => this.artworksApi.list(params) });
  protected readonly compareA = signal<number | null>(null);
  protected readonly compareB = signal<number | null>(null);
  /** The artwork a new share link shows: chosen, else the studio's newest (a link always has a picture). */
  protected readonly linkArtwork = linkedSignal<string>(() => (this.artworks.hasValue() ? (this.artworks.value()[0]?.id ?? '') : ''));
  /** How long a new share link works; "never" is a choice of its own, not what an empty field means. */
  protected readonly expiryChoices: { days: number | null; label: string }[] = [
    { days: 1, label: 'After 1 day' },
    { days: 7, label: 'After 7 days' },
    { days: 14, label: 'After 14 days' },
    { days: 30, label: 'After 30 days' },
    { days: 90, label: 'After 90 days' },
    { days: 365, label: 'After a year' },
    { days: null, label: 'Never' },
  ];
  protected readonly linkDays = signal<number | null>(14);
  protected readonly newLinkUrl = signal('');
  protected readonly duplicateTo = signal('');
  protected readonly renaming = signal(false);
  protected readonly typeName = computed(() =>
    this.preset.hasValue() ? (panelTypeById(this.preset.value().panelTypeId)?.name ?? '') : '',
  );
  protected readonly mayChange = computed(
    () => this.context.canEdit() && (!this.preset.hasValue() || !this.preset.value().isReference || this.context.canManage()),
  );
  /** The artwork the look and the revision compare are shown on: the newest until the user picks one. */
  protected readonly thumbArtwork = linkedSignal<string | undefined>(() =>
    this.artworks.hasValue() ? this.artworks.value()[0]?.id : undefined,
  );
  protected readonly thumbName = computed(() =>
    this.artworks.hasValue() ? (this.artworks.value().find((a) => a.id === this.thumbArtwork())?.name ?? '') : '',
  );
  protected readonly editableStudios = computed(() => this.auth.studios().filter((s) => s.role !== 'viewer'));
  protected readonly comparison = computed(() => {
    const list = this.revisions.hasValue() ? this.revisions.value() : [];
    const a = list.find((r) => r.revision === this.compareA());
    const b = list.find((r) => r.revision === this.compareB());
    return a && b ? { a, b, changes: paramDiff(a.parameters, b.parameters) } : null;
  });

  protected pick(r: PresetRevisionDto): void {
    if (this.compareA() === null || this.compareB() !== null) {
      this.compareA.set(r.revision);
      this.compareB.set(null);
    } else if (r.revision !== this.compareA()) {
      this.compareB.set(r.revision);
    }
  }

  protected async restore(r: PresetRevisionDto): Promise<void> {
    await this.act(async () => {
      const p = await this.api.restore(this.context.studioId(), this.presetId(), r.revision);
      this.preset.set(p);
      return `Revision ${r.revision} restored as revision ${p.revision}.`;
    });
  }

  protected async rename(name: string): Promise<void> {
    const p = this.preset.value()!;
    this.renaming.set(false);
    if (!name.trim() || name.trim() === p.name) return;
    await this.act(async () => {
      this.preset.set(
        await this.api.save(this.context.studioId(), p.id, {
          baseRevision: p.revision,
          name: name.trim(),
          message: `Renamed from “${p.name}”`,
        }),
      );
      return 'Renamed.';
    });
  }

  protected async toggleReference(): Promise<void> {
    const p = this.preset.value()!;
    await this.act(async () => {
      this.preset.set(await this.api.setReference(this.context.studioId(), p.id, !p.isReference));
      return p.isReference ? 'No longer the reference look.' : 'Now the studio’s reference look: only owners change it.';
    });
  }

  protected async exportPreset(): Promise<void> {
    const doc = await this.api.exportDocument(this.context.studioId(), this.presetId());
    downloadText(`${doc.name.replace(/[^\w .-]/g, '_')}.emberline-preset.json`, JSON.stringify(doc, null, 2), 'application/json');
  }

  protected async duplicate(): Promise<void> {
    const target = this.duplicateTo();
    if (!target) return;
    await this.act(async () => {
      const copy = await this.api.duplicate(this.context.studioId(), this.presetId(), target);
      await this.router.navigate(['/studios', target, 'presets', copy.id]);
      return `Copied as “${copy.name}”.`;
    });
  }

  protected describeChanges(changes: ParamChange[]): string {
    return changes.map(describeChange).join(' · ');
  }

  protected readonly label = changeLabel;
  protected readonly value = describeValue;

  protected async deletePreset(): Promise<void> {
    const name = this.preset.hasValue() ? this.preset.value().name : 'this preset';
    const live = this.links.hasValue()
      ? this.links.value().filter((l) => !l.revokedAt && (!l.expiresAt || new Date(l.expiresAt) > new Date())).length
      : 0;
    const confirmed = await this.confirm.ask({
      title: `Delete “${name}”?`,
      consequences: [
        'Its whole revision history is deleted with it.',
        live
          ? `Its ${live === 1 ? 'share link stops' : `${live} share links stop`} working at once: clients who have ${live === 1 ? 'it' : 'them'} will see that the link no longer works.`
          : 'It has no live share links.',
        'This cannot be undone.',
      ],
      action: 'Delete preset',
    });
    if (!confirmed) return;
    await this.act(async () => {
      await this.api.remove(this.context.studioId(), this.presetId());
      await this.router.navigate(['/studios', this.context.studioId(), 'presets']);
      return 'Preset deleted.';
    });
  }

  protected async createLink(): Promise<void> {
    await this.act(async () => {
      const link = await this.api.createLink(this.context.studioId(), this.presetId(), {
        artworkId: this.linkArtwork() || undefined,
        expiresInDays: this.linkDays() ?? undefined,
      });
      this.newLinkUrl.set(link.url ?? '');
      this.links.reload();
      return 'Share link created. Copy it now: it is shown only once.';
    });
  }

  protected async revokeLink(id: string): Promise<void> {
    await this.act(async () => {
      await this.api.revokeLink(this.context.studioId(), this.presetId(), id);
      this.links.reload();
      return 'Link revoked.';
    });
  }

  protected async copyLink(): Promise<void> {
    await navigator.clipboard.writeText(this.newLinkUrl()).then(
      () => this.snackBar.open('Link copied.', undefined, { duration: 2000 }),
      () => this.snackBar.open('Select the link and copy it.', undefined, { duration: 4000 }),
    );
  }

  private async act(run: () => Promise<string>): Promise<void> {
    try {
      this.snackBar.open(await run(), undefined, { duration: 4000 });
    } catch (err) {
      this.snackBar.open(apiErrorMessage(err), 'Dismiss', { duration: 8000 });
    }
  }
}

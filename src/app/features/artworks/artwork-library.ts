import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, DestroyRef, type ElementRef, inject, resource, signal, viewChild } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatSnackBar } from '@angular/material/snack-bar';
import { RouterLink } from '@angular/router';
import type { ArtworkDto } from '@shared/api/dto';
import { apiErrorMessage } from '../../core/api-error';
import { formatBytes } from '../../core/format-bytes';
import { Confirm } from '../../shared/confirm-dialog';
import { AutoFocus } from '../../shared/auto-focus';
import { StudioContext } from '../studio/studio-context';
import { ArtworkApi } from './artwork-api';

interface UploadItem {
  id: number;
  name: string;
  share: number;
  error: string;
}

/** The studio's artwork library: upload by drop, picker or paste; search, sort, rename, delete. */
@Component({
  selector: 'em-artwork-library',
  imports: [
    FormsModule,
    RouterLink,
    AutoFocus,
    DatePipe,
    MatButtonModule,
    MatIconModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatCheckboxModule,
    MatProgressBarModule,
  ],
  templateUrl: './artwork-library.html',
  styleUrl: './artwork-library.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ArtworkLibrary {
  private readonly api = inject(ArtworkApi);
  private readonly snackBar = inject(MatSnackBar);
  private readonly confirm = inject(Confirm);
  protected readonly context = inject(StudioContext);
  private readonly heading = viewChild<ElementRef<HTMLElement>>('heading');

  protected readonly query = signal('');
  protected readonly sort = signal<'newest' | 'oldest' | 'name'>('newest');
  protected readonly isSheet = signal(false);
  protected readonly frameWidth = signal(16);
  protected readonly frameHeight = signal(16);
  protected readonly frameDelayMs = signal(120);
  protected readonly uploads = signal<UploadItem[]>([]);
  protected readonly dragging = signal(false);
  protected readonly renaming = signal<string | null>(null);
  protected readonly artworks = resource({
    params: () => ({ studioId: this.context.studioId(), q: this.query().trim(), sort: this.sort() }),
    loader: ({ params }) => this.api.list(params.studioId, params.q, params.sort),
  });
  private nextUpload = 1;

  constructor() {
    const paste = (e: ClipboardEvent) => this.pasteFiles(e);
    document.addEventListener('paste', paste);
    inject(DestroyRef).onDestroy(() => document.removeEventListener('paste', paste));
  }

  protected dropFiles(e: DragEvent): void {
    e.preventDefault();
    this.dragging.set(false);
    if (this.context.canEdit()) this.uploadFiles(Array.from(e.dataTransfer?.files ?? []));
  }

  protected pickFiles(input: HTMLInputElement): void {
    this.uploadFiles(Array.from(input.files ?? []));
    input.value = '';
  }

  protected pasteFiles(e: ClipboardEvent): void {
    const files = Array.from(e.clipboardData?.files ?? []);
    if (files.length && this.context.canEdit()) {
      e.preventDefault();
      this.uploadFiles(files);
    }
  }

  protected readonly size = formatBytes;

  protected uploadFiles(files: File[]): void {
    // A new attempt replaces the errors of earlier ones: a stale message must not outlive a retry.
    this.uploads.update((list) => list.filter((u) => !u.error));
    const sheet = this.isSheet()
      ? { frameWidth: this.frameWidth(), frameHeight: this.frameHeight(), frameDelayMs: this.frameDelayMs() }
      : undefined;
    for (const file of files) {
      const item: UploadItem = { id: this.nextUpload++, name: file.name || 'pasted image', share: 0, error: '' };
      this.uploads.update((list) => [item, ...list]);
      const patch = (p: Partial<UploadItem>) => this.uploads.update((list) => list.map((u) => (u.id === item.id ? { ...u, ...p } : u)));
      this.api.upload(this.context.studioId(), file, sheet).subscribe({
        next: (e) => {
          if (e.kind === 'progress') patch({ share: e.share });
          else {
            this.uploads.update((list) => list.filter((u) => u.id !== item.id));
            this.artworks.reload();
          }
        },
        error: (err) => patch({ error: apiErrorMessage(err), share: 0 }),
      });
    }
  }

  protected dismissUpload(id: number): void {
    this.uploads.update((list) => list.filter((u) => u.id !== id));
  }

  protected async renameArtwork(a: ArtworkDto, name: string): Promise<void> {
    this.renaming.set(null);
    if (!name.trim() || name.trim() === a.name) return;
    try {
      await this.api.rename(this.context.studioId(), a.id, name.trim());
      this.artworks.reload();
    } catch (err) {
      this.snackBar.open(apiErrorMessage(err), 'Dismiss', { duration: 8000 });
    }
  }

  protected async deleteArtwork(a: ArtworkDto): Promise<void> {
    let links: { presetName: string }[];
    try {
      links = await this.api.liveLinks(this.context.studioId(), a.id);
    } catch (err) {
      this.snackBar.open(apiErrorMessage(err), 'Dismiss', { duration: 8000 });
      return;
    }
    const others = (this.artworks.hasValue() ? this.artworks.value() : []).filter((x) => x.id !== a.id);
    const names = [...new Set(links.map((l) => `“${l.presetName}”`))].join(', ');
    const linkLine = !links.length
      ? 'No live share link shows it.'
      : `${links.length === 1 ? 'One live share link shows it' : `${links.length} live share links show it`} (${names}): ${others.length ? 'they will show the studio’s newest other artwork instead.' : 'they will show no picture until you upload another artwork.'}`;
    const confirmed = await this.confirm.ask({
      title: `Delete “${a.name}”?`,
      consequences: ['The original file, its thumbnail and every render made from it are deleted.', linkLine, 'This cannot be undone.'],
      action: 'Delete artwork',
    });
    if (!confirmed) return;
    try {
      await this.api.remove(this.context.studioId(), a.id);
      this.snackBar.open(`Deleted “${a.name}”.`, undefined, { duration: 3000 });
      this.artworks.reload();
      // The card and its buttons are gone: focus the page's heading, not whatever card moved up.
      this.heading()?.nativeElement.focus();
    } catch (err) {
      this.snackBar.open(apiErrorMessage(err), 'Dismiss', { duration: 8000 });
    }
  }
}

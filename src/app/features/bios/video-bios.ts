import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, linkedSignal, resource, signal } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatSlideToggleModule } from '@angular/material/slide-toggle';
import { MatSnackBar } from '@angular/material/snack-bar';
import { RouterLink } from '@angular/router';
import type { VideoRomDto } from '@shared/api/dto';
import { hex2 } from '@shared/drive/registers';
import { describeEntry, patchRom, RomError, type RomEntry } from '@shared/drive/vga-rom';
import { apiErrorCode, apiErrorMessage } from '../../core/api-error';
import { formatBytes } from '../../core/format-bytes';
import { Confirm } from '../../shared/confirm-dialog';
import { downloadBlob } from '../drive/download';
import { TimingApi } from '../drive/timing-api';
import { StudioContext } from '../studio/studio-context';
import { FlashSafety } from './flash-safety';
import { RomApi } from './rom-api';

/** 0x… with four hex digits (offsets in an image). */
const hex4 = (n: number) => `0x${n.toString(16).toUpperCase().padStart(4, '0')}`;

/** An offset typed as decimal or 0x… hex; undefined when it is neither. */
function parseOffset(text: string): number | undefined {
  const t = text.trim();
  const n = /^0x[0-9a-f]+$/i.test(t) ? parseInt(t.slice(2), 16) : /^\d+$/.test(t) ? Number(t) : NaN;
  return Number.isInteger(n) ? n : undefined;
}

/**
 * The video BIOS workbench: upload a card's option ROM, see its header, checksum and VGA
 * parameter table, put a saved drive timing into one entry (byte diff first), and download the
 * patched image beside the original.
 */
@Component({
  selector: 'em-video-bios',
  imports: [
    FormsModule,
    DecimalPipe,
    RouterLink,
    MatButtonModule,
    MatButtonToggleModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatProgressBarModule,
    MatSelectModule,
    MatSlideToggleModule,
    FlashSafety,
  ],
  templateUrl: './video-bios.html',
  styleUrl: './video-bios.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class VideoBios {
  private readonly api = inject(RomApi);
  private readonly timingApi = inject(TimingApi);
  private readonly snackBar = inject(MatSnackBar);
  private readonly confirm = inject(Confirm);
  protected readonly context = inject(StudioContext);

  protected readonly hex2 = hex2;
  protected readonly hex4 = hex4;
  protected readonly formatBytes = formatBytes;
  protected readonly describeEntry = describeEntry;

  protected readonly roms = resource({
    params: () => (this.context.canEdit() ? this.context.studioId() : undefined),
    loader: ({ params }) => this.api.list(params),
  });
  protected readonly selectedId = linkedSignal<string | undefined>(() => (this.roms.hasValue() ? this.roms.value()[0]?.id : undefined));
  protected readonly selected = computed(() =>
    this.roms.hasValue() ? this.roms.value().find((r) => r.id === this.selectedId()) : undefined,
  );
  protected readonly nameOf = (id: string | null) =>
    id && this.roms.hasValue() ? (this.roms.value().find((r) => r.id === id)?.name ?? 'a deleted image') : '';

  /** Where to read the table: '' = as the image says (pointer, else scan). */
  protected readonly tableOffsetText = linkedSignal({ source: this.selectedId, computation: () => '' });
  protected readonly tableOffset = signal<number | undefined>(undefined);
  protected readonly detail = resource({
    params: () =>
      this.selectedId() ? { studioId: this.context.studioId(), id: this.selectedId()!, tableOffset: this.tableOffset() } : undefined,
    loader: ({ params }) => this.api.detail(params.studioId, params.id, params.tableOffset),
  });
  protected readonly info = computed(() => (this.detail.hasValue() ? this.detail.value().info : null));
  protected readonly bytes = resource({ params: () => this.selected(), loader: ({ params }) => this.api.image(params) });

  protected readonly showEmpty = signal(false);
  protected readonly listed = computed(() => (this.info()?.entries ?? []).filter((e) => this.showEmpty() || e.status !== 'empty'));
  protected readonly emptyCount = computed(() => (this.info()?.entries ?? []).filter((e) => e.status === 'empty').length);
  protected readonly usable = computed(() => (this.info()?.entries ?? []).filter((e) => e.status === 'ok'));

  protected readonly timings = resource({ params: () => this.context.studioId(), loader: ({ params }) => this.timingApi.list(params) });
  protected readonly entryIndex = linkedSignal(() => this.usable().find((e) => e.index === 0x1b)?.index ?? this.usable()[0]?.index);
  protected readonly timingId = linkedSignal(() => (this.timings.hasValue() ? this.timings.value()[0]?.id : undefined));
  protected readonly checksumMode = linkedSignal<string | undefined, 'last' | 'custom'>({
    source: this.selectedId,
    computation: () => 'last',
  });
  protected readonly checksumText = signal('');

  /** The byte diff the patch would make, computed here from the image before anything is saved. */
  protected readonly preview = computed(() => {
    const info = this.info();
    const bytes = this.bytes.hasValue() ? this.bytes.value() : undefined;
    const saved = this.timings.hasValue() ? this.timings.value().find((t) => t.id === this.timingId()) : undefined;
    const index = this.entryIndex();
    if (!info || !bytes || !saved || index === undefined) return null;
    let checksumAt: number | undefined;
    if (this.checksumMode() === 'custom') {
      checksumAt = parseOffset(this.checksumText());
      if (checksumAt === undefined) return { error: 'Type the checksum byte’s offset as a whole number, like 0x7FF0 or 32752.' };
    }
    try {
      return { patch: patchRom(bytes, info, index, saved.timing, { checksumAt }), timing: saved, checksumAt };
    } catch (err) {
      if (err instanceof RomError || err instanceof RangeError)
        return { error: `${err.message.charAt(0).toUpperCase()}${err.message.slice(1)}.` };
      throw err;
    }
  });
  protected readonly saving = signal(false);
  protected readonly uploading = signal(false);
  protected readonly uploadError = signal('');
  protected readonly dragging = signal(false);

  protected entryLabel(e: RomEntry): string {
    return `${hex2(e.index)}h${e.standardMode ? ` · ${e.standardMode}` : ''} · ${describeEntry(e)}`;
  }

  protected applyTableOffset(): void {
    const text = this.tableOffsetText().trim();
    if (!text) return this.tableOffset.set(undefined);
    const n = parseOffset(text);
    if (n === undefined) {
      this.snackBar.open('Type the table offset as a whole number, like 0x1000 or 4096.', 'Dismiss', { duration: 6000 });
      return;
    }
    this.tableOffset.set(n);
  }

  protected select(rom: VideoRomDto): void {
    this.selectedId.set(rom.id);
    this.tableOffset.set(undefined);
  }

  protected async pick(input: HTMLInputElement): Promise<void> {
    const file = input.files?.[0];
    input.value = '';
    if (file) await this.uploadFile(file);
  }

  protected async drop(e: DragEvent): Promise<void> {
    e.preventDefault();
    this.dragging.set(false);
    const file = e.dataTransfer?.files[0];
    if (file) await this.uploadFile(file);
  }

  private async uploadFile(file: File): Promise<void> {
    this.uploading.set(true);
    this.uploadError.set('');
    try {
      const rom = await this.api.upload(this.context.studioId(), file);
      this.roms.reload();
      this.selectedId.set(rom.id);
      this.snackBar.open(`Added “${rom.name}” (${formatBytes(rom.size)}).`, undefined, { duration: 3000 });
    } catch (err) {
      this.uploadError.set(`“${file.name}” was not added: ${apiErrorMessage(err)}`);
    } finally {
      this.uploading.set(false);
    }
  }

  /** Saves the previewed patch as a new image; an image patched before leads to its patch, with the user's word. */
  protected async savePatch(): Promise<void> {
    const rom = this.selected();
    const p = this.preview();
    if (!rom || !p || !('patch' in p) || !p.patch) return;
    let startFromPatched = false;
    if (rom.patchedFromId) {
      startFromPatched = await this.confirm.ask({
        title: `Patch “${rom.name}” again?`,
        consequences: [
          `It is already a patched image (made from “${this.nameOf(rom.patchedFromId)}”).`,
          'The new image carries both changes; this one stays as it is.',
        ],
        action: 'Start from the patched image',
      });
      if (!startFromPatched) return;
    }
    this.saving.set(true);
    try {
      const made = await this.api.patch(this.context.studioId(), rom.id, {
        entryIndex: this.entryIndex()!,
        timingId: p.timing.id,
        checksumAt: p.checksumAt,
        tableOffset: this.tableOffset(),
        startFromPatched: startFromPatched || undefined,
      });
      this.roms.reload();
      this.selectedId.set(made.rom.id);
      this.snackBar.open(`Saved “${made.rom.name}”: ${made.patch.changes.length} bytes changed. The original is kept.`, undefined, {
        duration: 5000,
      });
    } catch (err) {
      if (apiErrorCode(err) === 'already_patched') {
        const details = (err as { error?: { error?: { details?: { patchedId?: string; patchedName?: string } } } }).error?.error?.details;
        const go = await this.confirm.ask({
          title: `“${rom.name}” was patched already`,
          consequences: [`Its patch is “${details?.patchedName}”.`, 'Patch that image instead, so both changes end up in one file.'],
          action: 'Open the patched image',
        });
        if (go && details?.patchedId) this.selectedId.set(details.patchedId);
      } else {
        this.snackBar.open(apiErrorMessage(err), 'Dismiss', { duration: 8000 });
      }
    } finally {
      this.saving.set(false);
    }
  }

  protected download(rom: VideoRomDto): void {
    if (!this.bytes.hasValue() || this.selected()?.id !== rom.id) return;
    const name =
      rom.name
        .replace(/[^\p{L}\p{N} ._-]+/gu, ' ')
        .trim()
        .replace(/\s+/g, '-') || 'video-bios';
    downloadBlob(`${name}.rom`, new Blob([new Uint8Array(this.bytes.value())], { type: 'application/octet-stream' }));
  }

  protected async remove(rom: VideoRomDto): Promise<void> {
    const ok = await this.confirm.ask({
      title: `Delete “${rom.name}”?`,
      consequences: [
        rom.patchedIds.length
          ? `The ${rom.patchedIds.length} image(s) patched from it stay, without their source.`
          : 'Nothing else depends on it.',
        'This cannot be undone: keep a copy of the file if you may need it.',
      ],
      action: 'Delete image',
    });
    if (!ok) return;
    try {
      await this.api.remove(this.context.studioId(), rom.id);
      if (this.selectedId() === rom.id) this.selectedId.set(undefined);
      this.roms.reload();
      this.snackBar.open(`Deleted “${rom.name}”.`, undefined, { duration: 3000 });
    } catch (err) {
      this.snackBar.open(apiErrorMessage(err), 'Dismiss', { duration: 8000 });
    }
  }
}

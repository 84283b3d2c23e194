import { DatePipe, DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, resource, signal } from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatTooltipModule } from '@angular/material/tooltip';
import { ActivatedRoute, RouterLink } from '@angular/router';
import { catchError, filter, from, merge, of, Subject, switchMap, timer } from 'rxjs';
import { EXPORT_STATUS_LABELS, type ExportDto, type ExportKind, type ExportStatus } from '@shared/api/export.schema';
import {
  LABEL_LINES,
  MAX_SHEET_ARTWORKS,
  MAX_SHEET_CELLS,
  MAX_SHEET_LOOKS,
  MAX_SHEET_PIXELS,
  REPORT_LINES,
  SHEET_LAYOUT_LABELS,
  SHEET_LAYOUTS,
  sheetGeometry,
  type SheetLayout,
} from '@shared/export/sheet';
import { outputUniforms } from '@shared/pipeline/output/uniforms';
import { apiErrorMessage } from '../../core/api-error';
import { AuthStore } from '../../core/auth-store';
import { formatBytes } from '../../core/format-bytes';
import { Confirm } from '../../shared/confirm-dialog';
import { ArtworkApi } from '../artworks/artwork-api';
import { lookOptionsOf, type LookOption } from '../presets/look-options';
import { PresetApi } from '../presets/preset-api';
import { StudioContext } from '../studio/studio-context';
import { ExportApi } from './export-api';
import { ExportLinks } from './export-links';

const STATUS_ICONS: Readonly<Record<ExportStatus, string>> = {
  queued: 'schedule',
  running: 'autorenew',
  done: 'check_circle',
  failed: 'error',
  cancelled: 'block',
};

/**
 * Exports: comparison sheets of artworks × looks for clients and teammates, made in the
 * background. The form checks what the server will check (and shows the sheet's size) before
 * anything is sent; the list follows each job's progress while any is waiting or running.
 */
@Component({
  selector: 'em-exports',
  imports: [
    FormsModule,
    RouterLink,
    DatePipe,
    DecimalPipe,
    MatButtonModule,
    MatButtonToggleModule,
    MatCheckboxModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatProgressBarModule,
    MatSelectModule,
    MatTooltipModule,
    ExportLinks,
  ],
  templateUrl: './exports.html',
  styleUrl: './exports.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Exports {
  private readonly api = inject(ExportApi);
  private readonly artworkApi = inject(ArtworkApi);
  private readonly presetApi = inject(PresetApi);
  private readonly confirm = inject(Confirm);
  private readonly snackBar = inject(MatSnackBar);
  private readonly auth = inject(AuthStore);
  protected readonly context = inject(StudioContext);

  protected readonly layouts = SHEET_LAYOUTS;
  protected readonly layoutLabels = SHEET_LAYOUT_LABELS;
  protected readonly statusLabels = EXPORT_STATUS_LABELS;
  protected readonly statusIcons = STATUS_ICONS;
  protected readonly scales = [1, 2, 3, 4];
  protected readonly size = formatBytes;

  /** What the form makes: a comparison sheet, or an animation through one look. */
  protected readonly kind = signal<ExportKind>('sheet');
  protected readonly title = signal('');
  protected readonly layout = signal<SheetLayout>('grid');
  protected readonly artworkIds = signal<string[]>([]);
  protected readonly lookIds = signal<string[]>([]);
  protected readonly scale = signal(2);
  /** Counted from 1, as people count frames. */
  protected readonly frame = signal(1);
  /** Each render's analysis (legibility, light and power) under its label. */
  protected readonly withReport = signal(false);
  /** Animation: the one animation and the one look, and the flash check's viewing distance. */
  protected readonly animationId = signal<string | undefined>(undefined);
  protected readonly animationLook = signal<string | undefined>(undefined);
  protected readonly distanceMm = signal(600);
  protected readonly submitting = signal(false);
  /** The export whose share links are open. */
  protected readonly sharing = signal<string | null>(null);
  protected readonly submitError = signal('');

  protected readonly artworks = resource({
    params: () => this.context.studioId(),
    loader: ({ params }) => this.artworkApi.list(params, '', 'name'),
  });
  private readonly presets = resource({
    params: () => this.context.studioId(),
    loader: ({ params }) => this.presetApi.list(params, { sort: 'name', pageSize: 100 }),
  });
  protected readonly lookOptions = computed(() => lookOptionsOf(this.presets.hasValue() ? this.presets.value().presets : []));
  protected readonly studioLooks = computed(() => this.lookOptions().filter((l) => l.studio));
  protected readonly builtInLooks = computed(() => this.lookOptions().filter((l) => !l.studio));
  private readonly chosenLooks = computed(() =>
    this.lookIds()
      .map((id) => this.lookOptions().find((l) => l.id === id))
      .filter((l): l is LookOption => !!l),
  );
  private readonly chosenArtworks = computed(() =>
    (this.artworks.hasValue() ? this.artworks.value() : []).filter((a) => this.artworkIds().includes(a.id)),
  );
  /** Frames every chosen artwork has (1 until one is chosen). */
  protected readonly frames = computed(() => {
    const counts = this.chosenArtworks().map((a) => a.frameCount);
    return counts.length ? Math.min(...counts) : 1;
  });
  protected readonly cells = computed(() => this.artworkIds().length * this.lookIds().length);
  protected readonly animations = computed(() => (this.artworks.hasValue() ? this.artworks.value() : []).filter((a) => a.frameCount > 1));

  /** An animation's frames and their size, and what stops it (empty when it can go). */
  protected readonly animationPlan = computed(() => {
    const artwork = this.animations().find((a) => a.id === this.animationId());
    const look = this.lookOptions().find((l) => l.id === this.animationLook());
    if (!this.animations().length)
      return { problem: 'The library has no animation: upload a GIF, APNG, animated WebP or sprite sheet first.', summary: '' };
    if (!artwork) return { problem: 'Choose an animation.', summary: '' };
    if (!look) return { problem: 'Choose a look.', summary: '' };
    if (!(this.distanceMm() >= 50 && this.distanceMm() <= 100_000))
      return { problem: 'Give a viewing distance from 50 to 100,000 mm.', summary: '' };
    const u = outputUniforms(look.parameters, this.scale());
    const seconds = artwork.delaysMs.reduce((a, b) => a + b, 0) / 1000;
    return { problem: '', summary: `${artwork.frameCount} frames of ${u.width} × ${u.height} px · ${seconds.toFixed(1)} s a loop` };
  });

  /** The sheet's pixel size, as the server will lay it out. */
  protected readonly sheetSize = computed(() => {
    const looks = this.chosenLooks();
    const rows = this.artworkIds().length;
    if (!looks.length || !rows) return null;
    const sizes = looks.map((l) => {
      const u = outputUniforms(l.parameters, this.scale());
      return { width: u.width, height: u.height };
    });
    const row = this.layout() === 'grid' ? sizes : this.layout() === 'side-by-side' ? [sizes[0], ...sizes] : [...sizes, sizes[0]];
    const g = sheetGeometry(
      Array.from({ length: rows }, () => row),
      this.withReport() ? LABEL_LINES + REPORT_LINES : LABEL_LINES,
    );
    return { width: g.width, height: g.height, sizes };
  });

  /** What stops the request, in the words the server would use; empty when it can go. */
  protected readonly problem = computed(() => {
    const artworks = this.artworkIds().length;
    const looks = this.lookIds().length;
    if (!artworks) return 'Choose at least one artwork.';
    if (!looks) return 'Choose at least one look.';
    if (artworks > MAX_SHEET_ARTWORKS) return `Choose at most ${MAX_SHEET_ARTWORKS} artworks (${artworks} chosen).`;
    if (looks > MAX_SHEET_LOOKS) return `Choose at most ${MAX_SHEET_LOOKS} looks (${looks} chosen).`;
    if (artworks * looks > MAX_SHEET_CELLS) return `A sheet holds at most ${MAX_SHEET_CELLS} cells.`;
    if (this.layout() === 'ab-diff') {
      if (looks !== 2) return `An A/B sheet compares exactly two looks (${looks} chosen).`;
      const [a, b] = this.sheetSize()!.sizes;
      if (a.width !== b.width || a.height !== b.height)
        return 'An A/B sheet compares two renders of one size: choose two looks of one panel type.';
    }
    if (!Number.isInteger(this.frame()) || this.frame() < 1 || this.frame() > this.frames())
      return `Choose a frame from 1 to ${this.frames()}.`;
    const size = this.sheetSize()!;
    if (size.width * size.height > MAX_SHEET_PIXELS)
      return `The sheet would be ${size.width} × ${size.height} pixels, over the limit of ${MAX_SHEET_PIXELS / 1e6} million: lower the scale or choose fewer.`;
    return '';
  });

  protected readonly exports = signal<ExportDto[] | null>(null);
  protected readonly listError = signal('');
  private readonly busy = computed(() => (this.exports() ?? []).some((e) => e.status === 'queued' || e.status === 'running'));
  private readonly refresh = new Subject<void>();

  constructor() {
    // "Add to sheet" from the bench or a preset: ?artwork=<id>&look=<look id>.
    const query = inject(ActivatedRoute).snapshot.queryParamMap;
    if (query.get('artwork')) this.artworkIds.set([query.get('artwork')!]);
    if (query.get('look')) this.lookIds.set([query.get('look')!]);
    this.withReport.set(query.get('report') === '1');
    this.animationId.set(query.get('artwork') ?? undefined);
    this.animationLook.set(query.get('look') ?? undefined);
    // The list: at once, after each action, and every second while a job waits or runs.
    merge(this.refresh, timer(0, 1000).pipe(filter(() => this.exports() === null || this.busy())))
      .pipe(
        switchMap(() =>
          from(this.api.list(this.context.studioId())).pipe(
            catchError((err) => {
              this.listError.set(apiErrorMessage(err));
              return of(null);
            }),
          ),
        ),
        filter((list): list is ExportDto[] => list !== null),
        takeUntilDestroyed(),
      )
      .subscribe((list) => {
        this.listError.set('');
        this.exports.set(list);
      });
  }

  protected toggleLinks(id: string): void {
    this.sharing.update((open) => (open === id ? null : id));
  }

  protected canChange(e: ExportDto): boolean {
    return this.context.canManage() || (this.context.canEdit() && e.createdBy.id === this.auth.user()?.id);
  }

  protected percent(e: ExportDto): number {
    return Math.round(e.progress * 100);
  }

  protected lookSummary(e: ExportDto): string {
    return e.looks.map((l) => `${l.name}${l.revision ? ` r${l.revision}` : ''} (${l.panelTypeName})`).join(', ');
  }

  protected async make(): Promise<void> {
    const sheet = this.kind() === 'sheet';
    if ((sheet ? this.problem() : this.animationPlan().problem) || this.submitting()) return;
    this.submitting.set(true);
    this.submitError.set('');
    try {
      const title = this.title().trim();
      const named = title ? { title } : {};
      const studioId = this.context.studioId();
      const made = sheet
        ? await this.api.create(studioId, {
            ...named,
            layout: this.layout(),
            artworkIds: this.artworkIds(),
            looks: this.lookIds(),
            scale: this.scale(),
            frame: this.frame() - 1,
            report: this.withReport(),
          })
        : await this.api.createAnimation(studioId, {
            ...named,
            artworkId: this.animationId(),
            look: this.animationLook(),
            scale: this.scale(),
            distanceMm: this.distanceMm(),
          });
      this.exports.update((list) => [made, ...(list ?? [])]);
      this.snackBar.open(`“${made.title}” is queued: its progress shows below.`, undefined, { duration: 4000 });
    } catch (err) {
      this.submitError.set(apiErrorMessage(err));
    } finally {
      this.submitting.set(false);
    }
  }

  protected async cancel(e: ExportDto): Promise<void> {
    await this.act(() => this.api.cancel(this.context.studioId(), e.id), `Cancelled “${e.title}”.`);
  }

  protected async retry(e: ExportDto): Promise<void> {
    await this.act(() => this.api.retry(this.context.studioId(), e.id), `“${e.title}” is queued again.`);
  }

  protected async remove(e: ExportDto): Promise<void> {
    const running = e.status === 'queued' || e.status === 'running';
    const confirmed = await this.confirm.ask({
      title: `Delete “${e.title}”?`,
      consequences: [
        running ? 'Its job stops, and nothing it made is kept.' : 'The sheet file is deleted for everyone in the studio.',
        'This cannot be undone.',
      ],
      action: 'Delete export',
    });
    if (confirmed) await this.act(() => this.api.remove(this.context.studioId(), e.id), `Deleted “${e.title}”.`);
  }

  private async act(call: () => Promise<unknown>, done: string): Promise<void> {
    try {
      await call();
      this.snackBar.open(done, undefined, { duration: 3000 });
    } catch (err) {
      this.snackBar.open(apiErrorMessage(err), 'Dismiss', { duration: 8000 });
    }
    this.refresh.next();
  }
}

import { DatePipe, DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, resource, signal } from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatSliderModule } from '@angular/material/slider';
import { MatSnackBar } from '@angular/material/snack-bar';
import { RouterLink } from '@angular/router';
import { filter, from, switchMap, timer } from 'rxjs';
import type { MatchDto } from '@shared/api/match.schema';
import { FRAME_DATA_FORMAT_INFO, FRAME_DATA_FORMATS } from '@shared/drive/frame-data-formats';
import { MIN_PATTERN_COLS, MIN_PATTERN_ROWS } from '@shared/match/pattern';
import { apiErrorMessage } from '../../core/api-error';
import { AuthStore } from '../../core/auth-store';
import { Confirm } from '../../shared/confirm-dialog';
import { lookOptionsOf } from '../presets/look-options';
import { PresetApi } from '../presets/preset-api';
import { StudioContext } from '../studio/studio-context';
import { MarkPlacer } from './mark-placer';
import { MatchApi } from './match-api';

type Mark = [number, number];

/**
 * Panel match: fit a panel type to a photo of the real panel. Show the pattern on the panel,
 * photograph it, place four marks on its corner squares, check them against the simulated pattern,
 * and fit (a background job); the fitted figures, with their uncertainties and what the photo
 * could not tell, can be saved as a studio preset.
 */
@Component({
  selector: 'em-panel-match',
  imports: [
    FormsModule,
    RouterLink,
    DatePipe,
    DecimalPipe,
    MatButtonModule,
    MatCheckboxModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatProgressBarModule,
    MatSelectModule,
    MatSliderModule,
    MarkPlacer,
  ],
  templateUrl: './panel-match.html',
  styleUrl: './panel-match.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PanelMatch {
  private readonly api = inject(MatchApi);
  private readonly presetApi = inject(PresetApi);
  private readonly snackBar = inject(MatSnackBar);
  private readonly confirm = inject(Confirm);
  private readonly auth = inject(AuthStore);
  protected readonly context = inject(StudioContext);

  private readonly presets = resource({
    params: () => this.context.studioId(),
    loader: ({ params }) => this.presetApi.list(params, { sort: 'name', pageSize: 100 }),
  });
  /** Looks a pattern fits on (the pattern needs a panel of at least 64 × 32 cells). */
  protected readonly looks = computed(() =>
    lookOptionsOf(this.presets.hasValue() ? this.presets.value().presets : []).filter(
      (l) => l.parameters.cell.cols >= MIN_PATTERN_COLS && l.parameters.cell.rows >= MIN_PATTERN_ROWS,
    ),
  );
  protected readonly lookId = signal('el-amber-640x480.standard');
  protected readonly look = computed(() => this.looks().find((l) => l.id === this.lookId()));
  protected readonly activeWidth = signal(192);
  protected readonly activeHeight = signal(144);
  protected readonly camera = signal<'srgb' | 'gamma'>('srgb');
  protected readonly gamma = signal(2.2);
  protected readonly uploading = signal(false);
  protected readonly uploadError = signal('');

  protected readonly matches = signal<MatchDto[] | null>(null);
  protected readonly listError = signal('');
  protected readonly selected = signal<MatchDto | null>(null);
  protected readonly marks = signal<Mark[]>([]);
  protected readonly marksError = signal('');
  protected readonly checking = signal(false);
  /** Cache-busting stamp for the rectified photo after the marks change. */
  protected readonly checkedAt = signal(0);
  protected readonly overlay = signal(50);
  protected readonly presetName = signal('');
  protected readonly saving = signal(false);
  protected readonly running = computed(() => ['queued', 'running'].includes(this.selected()?.status ?? ''));
  protected readonly photoUrl = computed(() =>
    this.selected() ? `${this.api.base(this.context.studioId())}/${this.selected()!.id}/photo` : '',
  );
  protected readonly rectifiedUrl = computed(
    () => `${this.api.base(this.context.studioId())}/${this.selected()?.id}/rectified?at=${this.checkedAt()}`,
  );
  protected readonly simulatedUrl = computed(() => `${this.api.base(this.context.studioId())}/${this.selected()?.id}/simulated`);
  protected readonly residualUrl = computed(
    () => `${this.api.base(this.context.studioId())}/${this.selected()?.id}/residual?at=${this.selected()?.progress}`,
  );
  protected readonly patternUrl = computed(() => this.api.patternUrl(this.context.studioId(), this.lookId()));
  protected readonly frameDataFormats = FRAME_DATA_FORMATS.map((f) => ({ format: f, label: FRAME_DATA_FORMAT_INFO[f].label }));
  protected frameDataUrl(format: string): string {
    return this.api.patternUrl(this.context.studioId(), this.lookId(), format);
  }

  constructor() {
    this.setLook(this.lookId());
    // The list at once; the open match every second while its fit waits or runs.
    void this.reload();
    timer(1000, 1000)
      .pipe(
        filter(() => this.running()),
        switchMap(() => from(this.api.get(this.context.studioId(), this.selected()!.id).catch(() => null))),
        takeUntilDestroyed(),
      )
      .subscribe((m) => {
        if (!m || m.id !== this.selected()?.id) return;
        this.selected.set(m);
        if (!this.running()) void this.reload();
      });
  }

  /** A new look fills in its own active area (cells × pitch). */
  protected setLook(id: string): void {
    this.lookId.set(id);
    const cell = this.look()?.parameters.cell ?? this.looks().find((l) => l.id === id)?.parameters.cell;
    if (!cell) return;
    this.activeWidth.set(+(cell.cols * cell.pitchXMm).toFixed(2));
    this.activeHeight.set(+(cell.rows * cell.pitchYMm).toFixed(2));
  }

  private async reload(): Promise<void> {
    try {
      this.matches.set(await this.api.list(this.context.studioId()));
      this.listError.set('');
    } catch (err) {
      this.listError.set(apiErrorMessage(err));
    }
  }

  protected open(m: MatchDto): void {
    this.selected.set(m);
    this.marksError.set('');
    this.presetName.set(`${m.look.name}, fitted`);
    // Marks already placed, or a start just inside the photo's corners.
    const { width: w, height: h } = m.photo;
    this.marks.set(
      m.marks ?? [
        [w * 0.08, h * 0.08],
        [w * 0.92, h * 0.08],
        [w * 0.92, h * 0.92],
        [w * 0.08, h * 0.92],
      ],
    );
    this.checkedAt.set(m.marks ? Date.now() : 0);
  }

  protected canChange(m: MatchDto): boolean {
    return this.context.canManage() || (this.context.canEdit() && m.createdBy?.id === this.auth.user()?.id);
  }

  protected async upload(input: HTMLInputElement): Promise<void> {
    const file = input.files?.[0];
    input.value = '';
    if (!file || this.uploading()) return;
    this.uploading.set(true);
    this.uploadError.set('');
    try {
      const made = await this.api.upload(this.context.studioId(), file, {
        look: this.lookId(),
        activeWidthMm: this.activeWidth(),
        activeHeightMm: this.activeHeight(),
        cameraGamma: this.camera() === 'gamma' ? this.gamma() : null,
      });
      this.matches.update((list) => [made, ...(list ?? [])]);
      this.open(made);
    } catch (err) {
      this.uploadError.set(apiErrorMessage(err));
    } finally {
      this.uploading.set(false);
    }
  }

  /** Sends the marks; the server says why when they cannot be the panel's corners. */
  protected async checkMarks(): Promise<boolean> {
    const m = this.selected();
    if (!m) return false;
    this.checking.set(true);
    this.marksError.set('');
    try {
      this.selected.set(await this.api.setMarks(this.context.studioId(), m.id, this.marks()));
      this.checkedAt.set(Date.now());
      return true;
    } catch (err) {
      this.marksError.set(apiErrorMessage(err));
      return false;
    } finally {
      this.checking.set(false);
    }
  }

  protected async fit(): Promise<void> {
    const m = this.selected();
    if (!m || !(await this.checkMarks())) return;
    try {
      this.selected.set(await this.api.fit(this.context.studioId(), m.id));
    } catch (err) {
      this.marksError.set(apiErrorMessage(err));
    }
  }

  /** Saves the fit as a new preset, or (asRevision) as a new revision of the studio preset it started from. */
  /** Save the measured level curve as the preset's duty table. */
  protected readonly useLevelCurve = signal(false);

  protected async save(asRevision = false): Promise<void> {
    const m = this.selected();
    if (!m || this.saving() || (!asRevision && !this.presetName().trim())) return;
    this.saving.set(true);
    try {
      const saved = await this.api.save(this.context.studioId(), m.id, asRevision ? null : this.presetName().trim(), this.useLevelCurve());
      this.selected.set(saved.match);
      this.snackBar.open(
        asRevision ? `Saved as a new revision of “${m.look.name}”.` : `Saved “${this.presetName().trim()}” as a studio preset.`,
        undefined,
        { duration: 4000 },
      );
      this.presets.reload();
    } catch (err) {
      this.snackBar.open(apiErrorMessage(err), 'Dismiss', { duration: 8000 });
    } finally {
      this.saving.set(false);
    }
  }

  protected async remove(m: MatchDto): Promise<void> {
    const confirmed = await this.confirm.ask({
      title: `Delete the match of “${m.photo.fileName}”?`,
      consequences: [
        'The photo and the fit are deleted for everyone in the studio; a preset saved from it stays.',
        'This cannot be undone.',
      ],
      action: 'Delete match',
    });
    if (!confirmed) return;
    try {
      await this.api.remove(this.context.studioId(), m.id);
      if (this.selected()?.id === m.id) this.selected.set(null);
      await this.reload();
    } catch (err) {
      this.snackBar.open(apiErrorMessage(err), 'Dismiss', { duration: 8000 });
    }
  }

  /**
   * A figure and its standard uncertainty to the uncertainty's second significant digit
   * ("0.362 ± 0.009"); an uncertainty below a millionth reads as such.
   */
  protected withUncertainty(value: number, u: number): string {
    if (!(u >= 1e-6)) return `${value.toFixed(4)} ± < 0.000001`;
    const decimals = Math.min(6, Math.max(0, 1 - Math.floor(Math.log10(u))));
    return `${value.toFixed(decimals)} ± ${u.toFixed(decimals)}`;
  }

  protected percent(m: MatchDto): number {
    return Math.round(m.progress * 100);
  }
}

import { DecimalPipe } from '@angular/common';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  DestroyRef,
  effect,
  type ElementRef,
  inject,
  input,
  output,
  signal,
  untracked,
  viewChild,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { RouterLink } from '@angular/router';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import type { ChartConfiguration } from 'chart.js';
import { BaseChartDirective, provideCharts, withDefaultRegisterables } from 'ng2-charts';
import type { Acuity } from '@shared/analysis/acuity';
import type { FlashSafety } from '@shared/analysis/flash-safety';
import { LOST_CONTRAST, testPattern, type PanelReport } from '@shared/analysis/panel-report';
import type { PanelParams } from '@shared/model/parameters';
import type { Frame } from '@shared/pipeline/types';
import { apiErrorMessage } from '../../core/api-error';
import { ArtworkApi } from '../artworks/artwork-api';
import { downloadText } from '../drive/download';
import { StudioContext } from '../studio/studio-context';
import { BenchEngine } from './bench-engine';
import { levelCount } from '@shared/pipeline/levels/spacing';

/**
 * The bench's analysis of the current view: legibility (with a map of where one-cell detail is
 * lost), light and power per frame (charted with the flash figures), the burn-in map over a number
 * of hours, what the eye resolves at the viewing distance, and the flash check — each figure as
 * the bench computes it, and all of them as one JSON download.
 */
@Component({
  selector: 'em-analysis-report',
  imports: [DecimalPipe, RouterLink, MatButtonModule, MatIconModule, MatProgressBarModule, BaseChartDirective],
  providers: [provideCharts(withDefaultRegisterables())],
  templateUrl: './analysis-report.html',
  styleUrl: './analysis-report.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AnalysisReport {
  private readonly artworks = inject(ArtworkApi);
  protected readonly context = inject(StudioContext);
  private readonly snackBar = inject(MatSnackBar);
  private readonly engine = new BenchEngine();

  readonly frames = input<Frame[]>([]);
  readonly params = input.required<PanelParams>();
  readonly frame = input(0);
  readonly distanceMm = input.required<number>();
  readonly sight = input.required<Acuity>();
  readonly flash = input<FlashSafety | null>(null);
  /** What the downloads are called after. */
  readonly name = input('view');
  /** The artwork and look on the bench, for a comparison sheet that carries this analysis (editors only). */
  readonly sheetLink = input<{ artwork: string; look: string } | null>(null);
  /** A test pattern was added to the library (its artwork id). */
  readonly patternAdded = output<string>();

  protected readonly hours = signal(1000);
  protected readonly state = signal<{ busy: boolean; report?: PanelReport; error?: string }>({ busy: true });
  protected readonly lostContrast = LOST_CONTRAST;
  protected readonly adding = signal(false);
  private readonly lostCanvas = viewChild<ElementRef<HTMLCanvasElement>>('lostCanvas');
  private readonly wearCanvas = viewChild<ElementRef<HTMLCanvasElement>>('wearCanvas');
  private timer: ReturnType<typeof setTimeout> | undefined;
  private sentFrames?: Frame[];
  private maps?: { lost: Uint8Array; wear: Float32Array };

  protected readonly chart = computed<ChartConfiguration<'line'>['data'] | null>(() => {
    const report = this.state().report;
    const flash = this.flash();
    if (!report || report.light.length < 2) return null;
    const labels = report.light.map((_, k) => String(k + 1));
    return {
      labels,
      datasets: [
        {
          label: 'Mean luminance (cd/m²)',
          data: report.light.map((f) => Math.round(f.meanCdM2 * 10) / 10),
          yAxisID: 'y',
          borderColor: '#ffb347',
          backgroundColor: '#ffb347',
          tension: 0,
        },
        ...(flash
          ? [
              {
                label: 'Area changing by a flash step (%)',
                data: flash.frames.map((f) => Math.round(f.changingShare * 1000) / 10),
                yAxisID: 'y1',
                borderColor: '#6fb7e0',
                backgroundColor: '#6fb7e0',
                tension: 0,
              },
            ]
          : []),
      ],
    };
  });
  protected readonly chartOptions: ChartConfiguration<'line'>['options'] = {
    responsive: true,
    maintainAspectRatio: false,
    animation: false,
    scales: {
      x: { title: { display: true, text: 'Frame' }, ticks: { color: '#b9ab9a' }, grid: { color: '#3a3129' } },
      y: { title: { display: true, text: 'cd/m²' }, ticks: { color: '#b9ab9a' }, grid: { color: '#3a3129' } },
      y1: {
        position: 'right',
        min: 0,
        max: 100,
        title: { display: true, text: '% of the panel' },
        ticks: { color: '#b9ab9a' },
        grid: { drawOnChartArea: false },
      },
    },
    plugins: { legend: { labels: { color: '#e8dccd' } } },
  };
  protected readonly chartSummary = computed(() => {
    const r = this.state().report;
    if (!r) return '';
    const means = r.light.map((f) => f.meanCdM2);
    return `Mean luminance per frame from ${Math.min(...means).toFixed(1)} to ${Math.max(...means).toFixed(1)} cd/m² over ${means.length} frames.`;
  });

  constructor() {
    inject(DestroyRef).onDestroy(() => {
      this.engine.dispose();
      clearTimeout(this.timer);
    });
    // A moment after the last change of look, frame, artwork or hours.
    effect(() => {
      const frames = this.frames();
      const params = this.params();
      const frame = this.frame();
      const hours = this.hours();
      clearTimeout(this.timer);
      if (!frames.length) return;
      untracked(() => this.state.update((s) => ({ ...s, busy: true })));
      this.timer = setTimeout(() => void this.run(frames, params, frame, hours), 300);
    });
  }

  private async run(frames: Frame[], params: PanelParams, frame: number, hours: number): Promise<void> {
    if (this.sentFrames !== frames) {
      this.engine.setFrames(frames);
      this.sentFrames = frames;
    }
    try {
      const result = await this.engine.report(params, Math.min(frame, frames.length - 1), hours);
      if (!result) return;
      this.maps = { lost: result.lostCells, wear: result.wear };
      this.state.set({ busy: false, report: result.report });
      setTimeout(() => this.drawMaps(params));
    } catch (err) {
      this.state.set({ busy: false, error: (err as Error).message });
    }
  }

  /** The lost-detail overlay (red over the panel's cells) and the wear map (brighter = more worn). */
  private drawMaps(p: PanelParams): void {
    const maps = this.maps;
    const { cols, rows } = p.cell;
    if (!maps || maps.lost.length !== cols * rows) return;
    const paint = (canvas: HTMLCanvasElement | undefined, pixel: (i: number) => [number, number, number]) => {
      if (!canvas) return;
      canvas.width = cols;
      canvas.height = rows;
      const img = new ImageData(cols, rows);
      for (let i = 0; i < cols * rows; i++) {
        const [r, g, b] = pixel(i);
        img.data.set([r, g, b, 255], i * 4);
      }
      canvas.getContext('2d')!.putImageData(img, 0, 0);
    };
    paint(this.lostCanvas()?.nativeElement, (i) => (maps.lost[i] ? [255, 64, 64] : [40, 34, 28]));
    paint(this.wearCanvas()?.nativeElement, (i) => {
      const w = maps.wear[i];
      return [Math.round(40 + 215 * w), Math.round(34 + 140 * w), Math.round(28 + 20 * w)];
    });
  }

  protected setHours(value: unknown): void {
    const n = Math.round(Number(value));
    if (Number.isFinite(n) && n >= 1 && n <= 100_000) this.hours.set(n);
  }

  protected downloadJson(): void {
    const report = this.state().report;
    if (!report) return;
    const { frames: flashFrames, ...flash } = this.flash() ?? { frames: [] };
    const doc = {
      format: 'emberline.analysis',
      version: 1,
      view: this.name(),
      distanceMm: this.distanceMm(),
      acuity: this.sight(),
      flash: this.flash() ? { ...flash, frames: flashFrames } : null,
      ...report,
    };
    const file = `${
      this.name()
        .replace(/[^\p{L}\p{N} ._-]+/gu, ' ')
        .trim()
        .replace(/\s+/g, '-') || 'view'
    }-analysis.json`;
    downloadText(file, JSON.stringify(doc, null, 2), 'application/json');
  }

  /** A test pattern at this panel's size, added to the library as a PNG. */
  protected async addPattern(): Promise<void> {
    const { cols, rows } = this.params().cell;
    const pattern = testPattern(cols, rows, levelCount(this.params().drive));
    const canvas = document.createElement('canvas');
    canvas.width = cols;
    canvas.height = rows;
    canvas.getContext('2d')!.putImageData(new ImageData(new Uint8ClampedArray(pattern.data), cols, rows), 0, 0);
    this.adding.set(true);
    try {
      const blob = await new Promise<Blob>((resolve, reject) =>
        canvas.toBlob((b) => (b ? resolve(b) : reject(new Error('the browser could not make the PNG'))), 'image/png'),
      );
      const file = new File([blob], `Test pattern ${cols}×${rows}.png`, { type: 'image/png' });
      let id = '';
      await new Promise<void>((resolve, reject) =>
        this.artworks.upload(this.context.studioId(), file).subscribe({
          next: (e) => {
            if (e.kind === 'done') id = e.artwork.id;
          },
          error: reject,
          complete: resolve,
        }),
      );
      this.snackBar.open(`Added “Test pattern ${cols}×${rows}” to the library.`, undefined, { duration: 3000 });
      if (id) this.patternAdded.emit(id);
    } catch (err) {
      this.snackBar.open(apiErrorMessage(err), 'Dismiss', { duration: 8000 });
    } finally {
      this.adding.set(false);
    }
  }
}

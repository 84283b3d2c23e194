import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, DestroyRef, inject, input, linkedSignal, signal } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { MatSnackBar } from '@angular/material/snack-bar';
import { BITS_PER_CELL, checkFrameLayout, describeLayout, frameData, MAX_FRC_LEVELS, type FrameLayout } from '@shared/drive/frame-data';
import { frameLayoutSvg } from '@shared/drive/frame-data-diagram';
import {
  cIdentifier,
  encodeFrameData,
  FRAME_DATA_FORMAT_INFO,
  FRAME_DATA_FORMATS,
  type FrameDataFormat,
} from '@shared/drive/frame-data-formats';
import { PIXELS_PER_CLOCK, type PanelInterface } from '@shared/drive/interface';
import type { PanelParams } from '@shared/model/parameters';
import type { RgbaImage } from '@shared/pipeline/types';
import { downloadBlob, downloadText } from './download';
import { frcFrames } from '@shared/pipeline/levels/levels';
import { levelCount } from '@shared/pipeline/levels/spacing';

let instances = 0;

/** The fewest bits a cell that hold a preset's gray levels. */
const bitsFor = (grayLevels: number): FrameLayout['bitsPerCell'] => (grayLevels <= 2 ? 1 : grayLevels <= 4 ? 2 : 4);

/**
 * Frame data for the real panel: the cells the preview shows (after fit, tone, levels and
 * dither), packed in the layout the panel's interface shifts out, with the layout drawn bit by
 * bit and a download as raw binary, Intel HEX or a C header. Packing runs in the page: the
 * artwork never leaves it again.
 */
@Component({
  selector: 'em-frame-data-export',
  imports: [
    FormsModule,
    DecimalPipe,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatButtonModule,
    MatButtonToggleModule,
    MatIconModule,
  ],
  templateUrl: './frame-data-export.html',
  styleUrl: './frame-data-export.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class FrameDataExport {
  private readonly snackBar = inject(MatSnackBar);

  /** The artwork frame to pack (undefined while it loads). */
  readonly image = input<RgbaImage | undefined>();
  /** The look: its cell grid, tone, gray levels and dither decide the cells. */
  readonly params = input.required<PanelParams>();
  /** The saved drive timing's interface, where one is chosen: pixels per clock and dual scan start from it. */
  readonly panelInterface = input<PanelInterface | undefined>();
  /** What the file is called (the C array takes the same name). */
  readonly name = input('frame data');

  protected readonly bitsOptions = BITS_PER_CELL;
  protected readonly clockOptions = PIXELS_PER_CLOCK;
  protected readonly formats = FRAME_DATA_FORMATS.map((f) => ({ value: f, ...FRAME_DATA_FORMAT_INFO[f] }));
  protected readonly frcOptions = Array.from({ length: MAX_FRC_LEVELS - 2 }, (_, k) => k + 3);

  // Choices start from the look and the timing and follow them when they change, not when any
  // other figure of theirs does (the inputs are new objects on every edit): hence the primitives.
  private readonly grayLevels = computed(() => levelCount(this.params().drive));
  private readonly timingClock = computed(() => this.panelInterface()?.pixelsPerClock ?? 1);
  private readonly timingDualScan = computed(() => !!this.panelInterface()?.dualScan);
  protected readonly bits = linkedSignal(() => bitsFor(this.grayLevels()));
  protected readonly bitOrder = signal<FrameLayout['bitOrder']>('msb');
  protected readonly pixelsPerClock = linkedSignal(() => this.timingClock());
  protected readonly scan = linkedSignal<FrameLayout['scan']>(() => (this.timingDualScan() ? 'dual-interleaved' : 'single'));
  /** 0 = off; otherwise the gray levels frame-rate control makes on a 1-bit panel. */
  protected readonly frcLevels = signal(0);
  protected readonly format = signal<FrameDataFormat>('c');
  protected readonly fileName = linkedSignal(() => this.name());
  protected readonly packing = signal(false);

  protected readonly layout = computed<FrameLayout>(() => ({
    bitsPerCell: this.bits(),
    bitOrder: this.bitOrder(),
    pixelsPerClock: this.pixelsPerClock(),
    scan: this.scan(),
    frcLevels: this.bits() === 1 ? this.frcLevels() : 0,
  }));
  protected readonly grid = computed(() => ({ cols: this.params().cell.cols, rows: this.params().cell.rows }), {
    equal: (a, b) => a.cols === b.cols && a.rows === b.rows,
  });
  /** Why this layout cannot hold the panel's cells, in words, or ''. */
  protected readonly problem = computed(() => {
    try {
      checkFrameLayout(this.layout(), this.grid().cols, this.grid().rows, this.grayLevels());
      return '';
    } catch (err) {
      return (err as Error).message;
    }
  });
  protected readonly levels = computed(() => this.layout().frcLevels || this.grayLevels());
  protected readonly description = computed(() =>
    this.problem() ? [] : describeLayout(this.layout(), this.grid().cols, this.grid().rows, this.levels()),
  );
  protected readonly sizes = computed(() => {
    const frameBytes = (this.grid().cols * this.grid().rows * this.bits()) / 8;
    const frames = this.layout().frcLevels ? this.layout().frcLevels - 1 : frcFrames(this.params().drive.dither);
    return { frameBytes, frames, total: frameBytes * frames };
  });
  protected readonly arrayName = computed(() => cIdentifier(this.fileName()));
  protected readonly formatLabel = computed(() => FRAME_DATA_FORMAT_INFO[this.format()].label);
  /** Unique per instance, so two exports on one page keep their own headings. */
  protected readonly titleId = `frame-data-title-${++instances}`;

  protected readonly svg = computed(() => (this.problem() ? '' : frameLayoutSvg(this.layout(), this.grid().cols, this.grid().rows)));
  private previousUrl = '';
  protected readonly svgUrl = computed(() => {
    if (this.previousUrl) URL.revokeObjectURL(this.previousUrl);
    this.previousUrl = this.svg() ? URL.createObjectURL(new Blob([this.svg()], { type: 'image/svg+xml' })) : '';
    return this.previousUrl;
  });

  constructor() {
    inject(DestroyRef).onDestroy(() => this.previousUrl && URL.revokeObjectURL(this.previousUrl));
  }

  /** File names keep letters, digits, dots, dashes and underscores. */
  private baseName(): string {
    return (
      this.fileName()
        .trim()
        .replace(/[^\p{L}\p{N}._-]+/gu, '-')
        .replace(/^-+|-+$/g, '') || 'frame-data'
    );
  }

  protected async download(): Promise<void> {
    const image = this.image();
    if (!image || this.problem()) return;
    this.packing.set(true);
    // Let the button show its busy state before the page packs the cells.
    await new Promise((resolve) => setTimeout(resolve));
    try {
      const data = frameData(image, this.params(), this.layout());
      const format = this.format();
      const info = FRAME_DATA_FORMAT_INFO[format];
      const file = `${this.baseName()}.${info.extension}`;
      downloadBlob(file, new Blob([encodeFrameData(data, format, this.fileName())], { type: info.type }));
      this.snackBar.open(
        `Saved ${file}: ${data.frames > 1 ? `${data.frames} frames of ` : ''}${data.frameBytes.toLocaleString('en-US')} bytes${format === 'bin' ? '' : ` as ${info.label}`}.`,
        undefined,
        { duration: 4000 },
      );
    } catch (err) {
      this.snackBar.open(`The frame data could not be made: ${(err as Error).message}.`, 'Dismiss', { duration: 8000 });
    } finally {
      this.packing.set(false);
    }
  }

  protected downloadDiagram(): void {
    downloadText(`${this.baseName()}-layout.svg`, this.svg(), 'image/svg+xml');
  }
}

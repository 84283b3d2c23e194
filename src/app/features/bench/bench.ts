import { DecimalPipe } from '@angular/common';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  DestroyRef,
  effect,
  ElementRef,
  inject,
  input,
  linkedSignal,
  resource,
  signal,
  untracked,
  viewChild,
} from '@angular/core';
import { FormsModule } from '@angular/forms';
import { defer, repeat, timer, type Subscription } from 'rxjs';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelect, MatSelectModule } from '@angular/material/select';
import { MatSliderModule } from '@angular/material/slider';
import { MatSlideToggleModule } from '@angular/material/slide-toggle';
import { MatTooltipModule } from '@angular/material/tooltip';
import { RouterLink } from '@angular/router';
import { acuity } from '@shared/analysis/acuity';
import type { FlashSafety } from '@shared/analysis/flash-safety';
import { withPngText } from '@shared/api/png-text';
import { BUILT_IN_PRESETS, DEFAULT_PANEL_TYPE_ID, PANEL_TYPES, panelTypeById } from '@shared/model/panel-types';
import type { PanelParams } from '@shared/model/parameters';
import { outputUniforms } from '@shared/pipeline/output/uniforms';
import type { Frame } from '@shared/pipeline/types';
import { MatSnackBar } from '@angular/material/snack-bar';
import { apiErrorMessage } from '../../core/api-error';
import { PresetApi } from '../presets/preset-api';
import { ArtworkApi } from '../artworks/artwork-api';
import { TimingApi } from '../drive/timing-api';
import { StudioContext } from '../studio/studio-context';
import { BenchEngine } from './bench-engine';
import { PanelPreview, putImage } from './panel-preview';
import { PresetSave } from './preset-save';
import type { PresetDto } from '@shared/api/dto';
import { applyParamEdit, ParamControls, type ParamEdit, type ParamLock } from './param-controls';
import { Confirm } from '../../shared/confirm-dialog';
import { describeChange, paramDiff } from '@shared/model/param-diff';
import { RenderApi } from './render-api';
import { DriftCheck } from './drift-check';
import { downloadBlob } from '../drive/download';
import { FrameDataExport } from '../drive/frame-data-export';
import { AnalysisReport } from './analysis-report';
import { frcFrames, isFrc } from '@shared/pipeline/levels/levels';
import { clampView, cssTransform, homeView, imagePointAt, viewMatrix, zoomAround, type Size, type ViewState } from './view-transform';

/** ID-1 card width in mm (ISO/IEC 7810), the on-screen ruler for real size. */
const CARD_MM = { width: 85.6, height: 53.98 };
const CSS_PX_PER_MM = 96 / 25.4;
/** The calibration slider's range, screen pixels per millimetre. */
const clampPxPerMm = (v: number) => Math.min(12, Math.max(2, v));

/** The bench: artwork live on a simulated panel, tuned by hand, checked against the server. */
@Component({
  selector: 'em-bench',
  imports: [
    FormsModule,
    DecimalPipe,
    RouterLink,
    MatInputModule,
    MatButtonModule,
    MatButtonToggleModule,
    MatFormFieldModule,
    MatSelectModule,
    MatSliderModule,
    MatSlideToggleModule,
    MatIconModule,
    MatProgressBarModule,
    MatTooltipModule,
    ParamControls,
    FrameDataExport,
    AnalysisReport,
    PanelPreview,
    PresetSave,
  ],
  templateUrl: './bench.html',
  styleUrl: './bench.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Bench {
  private readonly api = inject(ArtworkApi);
  private readonly timingsApi = inject(TimingApi);
  private readonly presetApi = inject(PresetApi);
  private readonly snackBar = inject(MatSnackBar);
  private readonly confirm = inject(Confirm);
  private readonly renders = inject(RenderApi);
  private readonly driftCheck = inject(DriftCheck);
  protected readonly context = inject(StudioContext);

  /** ?artwork= from the library. */
  readonly artwork = input<string | undefined>();
  /** ?renderer=cpu forces the CPU path (as without WebGL2). */
  readonly renderer = input<string | undefined>();
  /** ?preset= a studio preset to open. */
  readonly preset = input<string | undefined>();

  private readonly preview = viewChild(PanelPreview);
  private readonly bCanvas = viewChild<ElementRef<HTMLCanvasElement>>('bCanvas');
  private readonly cCanvas = viewChild<ElementRef<HTMLCanvasElement>>('cCanvas');
  private readonly dCanvas = viewChild<ElementRef<HTMLCanvasElement>>('dCanvas');
  private readonly diffCanvas = viewChild<ElementRef<HTMLCanvasElement>>('diffCanvas');
  private readonly driftSection = viewChild<ElementRef<HTMLElement>>('driftSection');
  private readonly stageWrap = viewChild<ElementRef<HTMLElement>>('stageWrap');
  private readonly engineB = new BenchEngine();
  private readonly engineFlash = new BenchEngine();

  protected readonly panelTypes = PANEL_TYPES;
  protected readonly artworks = resource({ params: () => this.context.studioId(), loader: ({ params }) => this.api.list(params) });
  protected readonly artworkId = linkedSignal(
    () => this.artwork() ?? (this.artworks.hasValue() ? this.artworks.value()[0]?.id : undefined),
  );
  protected readonly selected = computed(() =>
    this.artworks.hasValue() ? this.artworks.value().find((a) => a.id === this.artworkId()) : undefined,
  );
  protected readonly frames = resource({ params: () => this.selected(), loader: ({ params }) => this.api.frames(params) });
  protected readonly panelTypeId = signal(DEFAULT_PANEL_TYPE_ID);
  protected readonly studioPresets = resource({
    params: () => this.context.studioId(),
    loader: ({ params }) => this.presetApi.list(params, { pageSize: 100, sort: 'name' }).then((r) => r.presets),
  });
  protected readonly presets = computed(() => BUILT_IN_PRESETS.filter((p) => p.panelTypeId === this.panelTypeId()));
  protected readonly ownPresets = computed(() =>
    this.studioPresets.hasValue() ? this.studioPresets.value().filter((p) => p.panelTypeId === this.panelTypeId()) : [],
  );
  /** A built-in preset id, or "studio:<id>" for a studio preset. */
  protected readonly presetId = linkedSignal(() => this.presets()[0].id);
  protected readonly studioPreset = computed(() =>
    this.presetId().startsWith('studio:') ? this.ownPresets().find((p) => `studio:${p.id}` === this.presetId()) : undefined,
  );
  protected readonly defaults = computed(
    () =>
      this.studioPreset()?.parameters ?? BUILT_IN_PRESETS.find((p) => p.id === this.presetId())?.parameters ?? this.presets()[0].parameters,
  );
  protected readonly mayChangePreset = computed(
    () => this.context.canEdit() && !!this.studioPreset() && (!this.studioPreset()!.isReference || this.context.canManage()),
  );
  protected readonly dirty = computed(() => JSON.stringify(this.params()) !== JSON.stringify(this.defaults()));
  protected readonly params = linkedSignal<PanelParams>(() => structuredClone(this.defaults()));
  protected readonly timings = resource({
    params: () => ({ studioId: this.context.studioId(), panelTypeId: this.panelTypeId() }),
    loader: ({ params }) => this.timingsApi.list(params.studioId).then((t) => t.filter((x) => x.panelTypeId === params.panelTypeId)),
  });
  protected readonly timingId = linkedSignal<string, string>({ source: this.panelTypeId, computation: () => '' });
  protected readonly scale = signal(2);
  protected readonly zoom = signal<'fit' | 'pixels' | 'real'>('fit');
  protected readonly compare = signal<'off' | 'original' | 'preset' | 'four'>('off');
  /** Looks to compare with: the studio's presets of this panel type, then the built-in ones. */
  protected readonly compareLooks = computed(() => [
    ...this.ownPresets().map((p) => ({ id: `studio:${p.id}`, name: `r${p.revision} · ${p.name}`, parameters: p.parameters })),
    ...this.presets().map((p) => ({ id: p.id, name: p.name, parameters: p.parameters })),
  ]);
  protected readonly comparePresetId = linkedSignal(() => this.presets()[1]?.id ?? this.presets()[0].id);
  /** The 2 × 2 split's other two looks (bottom left C, bottom right D). */
  protected readonly comparePresetIdC = linkedSignal(() => this.compareLooks()[2]?.id ?? this.compareLooks()[0].id);
  protected readonly comparePresetIdD = linkedSignal(() => this.compareLooks()[3]?.id ?? this.compareLooks()[0].id);
  protected readonly lookName = (id: string) => this.compareLooks().find((l) => l.id === id)?.name ?? 'Another look';
  protected readonly split = signal(50);
  protected readonly frame = linkedSignal({ source: this.selected, computation: () => 0 });
  protected readonly playing = signal(false);
  protected readonly flashAccepted = signal(false);
  protected readonly pxPerMm = signal(Number(localStorage.getItem('emberline.pxPerMm')) || CSS_PX_PER_MM);
  protected readonly calibrating = signal(false);
  protected readonly status = signal('');
  protected readonly lastMs = signal(0);
  /** Finished draws, for tests and the benchmark to wait on. */
  protected readonly draws = signal(0);
  protected readonly usingCpu = computed(() => this.preview()?.usingCpu() ?? false);
  protected readonly inspect = signal<{ c: number; r: number; level: number; cd: number } | null>(null);
  protected readonly drift = signal<{ busy: boolean; share?: number; pixels?: number; maxChannel?: number; error?: string }>({
    busy: false,
  });
  protected readonly reducedMotion = matchMedia('(prefers-reduced-motion: reduce)').matches;
  protected readonly card = CARD_MM;

  protected readonly uniforms = computed(() => outputUniforms(this.params(), this.scale()));
  /** The preview's visible box, CSS px (measured). */
  private readonly box = signal<Size>({ width: 0, height: 0 });
  /** The output image's size, output px. */
  private readonly imageSize = computed<Size>(() => ({ width: this.uniforms().width, height: this.uniforms().height }));
  /** CSS px per output px at the mode's own scale: the image fitted to the box, one CSS px a pixel, or millimetres true. */
  protected readonly baseScale = computed(() => {
    const { width, height } = this.imageSize();
    if (this.zoom() === 'pixels') return 1;
    if (this.zoom() === 'real') return (this.params().cell.cols * this.params().cell.pitchXMm * this.pxPerMm()) / width;
    const box = this.box();
    return box.width > 0 && box.height > 0 ? Math.min(box.width / width, box.height / height) : 1;
  });
  /** The box's height as the layout gives it: the image's at the mode's scale (fitted by width for Fit), held to the page's limit by CSS. */
  protected readonly boxHeight = computed(() => {
    const { width, height } = this.imageSize();
    const k = this.zoom() === 'fit' ? this.box().width / width : this.baseScale();
    return Math.max(120, Math.round(height * (k || 1)));
  });
  /** The user's zoom and pan; null: the mode's own view (and it follows the box as it resizes). */
  protected readonly userView = signal<ViewState | null>(null);
  protected readonly view = computed(() => this.userView() ?? homeView(this.imageSize(), this.box(), this.baseScale()));
  /** One matrix places every layer of the stage; inverted, it finds the cell under the pointer. */
  protected readonly viewMatrix = computed(() => viewMatrix(this.baseScale(), this.view()));
  protected readonly stageTransform = computed(() => cssTransform(this.viewMatrix()));
  /** On screen pixels per output pixel: above 1.5 the canvases are shown as blocks, not blurred. */
  protected readonly magnification = computed(() => this.baseScale() * this.view().zoom);
  /** How far the viewer is from the panel (kept in this browser): flash areas and acuity depend on it. */
  protected readonly distanceMm = signal(Number(localStorage.getItem('emberline.distanceMm')) || 600);
  protected readonly sight = computed(() => {
    const c = this.params().cell;
    return acuity(Math.max(c.pitchXMm, c.pitchYMm), this.distanceMm(), { widthMm: c.cols * c.pitchXMm, heightMm: c.rows * c.pitchYMm });
  });
  /** The flash check of the animation on the light this look makes the panel emit (computed in a worker). */
  protected readonly flashCheck = signal<{ busy: boolean; report?: FlashSafety; error?: string }>({ busy: false });
  protected readonly flash = computed(() => this.flashCheck().report ?? null);
  protected readonly flashFails = computed(() => this.flash()?.pass === false);
  /** Nothing flickers or plays while the flash check runs, or fails and has not been accepted. */
  protected readonly flashBlocked = computed(
    () => (this.flashFails() && !this.flashAccepted()) || (this.flashCheck().busy && !this.flash()),
  );
  protected readonly linkedTiming = computed(() =>
    this.timings.hasValue() ? this.timings.value().find((t) => t.id === this.timingId()) : undefined,
  );
  /** While a saved timing drives the refresh rate, the Refresh control shows it read-only. */
  protected readonly locks = computed(() => {
    const t = this.linkedTiming();
    const locks: Record<string, ParamLock> = {};
    if (t) locks['drive.refreshHz'] = { reason: `Set by the drive timing “${t.name}”. Choose “Panel type's own refresh” to set it here.` };
    return locks;
  });
  /** Binds an edit from the controls to the current parameters (see ParamEdit). */
  protected readonly applyEdit = (edit: ParamEdit) => (p: PanelParams) => applyParamEdit(p, edit);
  protected readonly showFrameData = signal(false);
  protected readonly showAnalysis = signal(false);
  /** The frame on the bench, as decoded (the frame data packs it through the current look). */
  protected readonly currentImage = computed(() => (this.frames.hasValue() ? this.frames.value()[this.frame()]?.image : undefined));
  /** Downloads are named after the artwork and the look. */
  protected readonly downloadName = computed(() => `${this.selected()?.name ?? 'artwork'} ${this.labelA()}`);
  /** On: the preview plays each refresh of the frame-rate-control cycle instead of its average. */
  protected readonly showFlicker = signal(false);
  /** Refreshes of the cycle drawn since the flicker was turned on (the page tells how it goes). */
  protected readonly flickerShown = signal(0);

  /** What the flash check looks at, in words: the animation, or a still's frame-rate-control flicker. */
  protected readonly flashSubject = computed(() =>
    this.frames.hasValue() && this.frames.value().length > 1 ? 'the animation' : 'the frame-rate control flicker',
  );
  protected readonly frcFlickerHz = computed(() => {
    const d = this.params().drive;
    return isFrc(d.dither) ? d.refreshHz / frcFrames(d.dither) : null;
  });

  constructor() {
    const destroy = inject(DestroyRef);
    destroy.onDestroy(() => {
      this.engineB.dispose();
      this.engineFlash.dispose();
      clearTimeout(this.flashTimer);
      this.playing.set(false);
    });
    // The preview's box, measured as the layout changes it.
    effect((onCleanup) => {
      const el = this.stageWrap()?.nativeElement;
      if (!el) return;
      const observer = new ResizeObserver(() => this.box.set({ width: el.clientWidth, height: el.clientHeight }));
      observer.observe(el);
      onCleanup(() => observer.disconnect());
    });
    effect((onCleanup) => {
      if (!this.playing()) return;
      const playback = untracked(() => this.play());
      onCleanup(() => playback.unsubscribe());
    });
    // A linked saved timing drives the panel's refresh rate (persistence and flicker).
    effect(() => {
      const t = this.linkedTiming();
      if (t)
        untracked(() =>
          this.params.update((p) => ({ ...p, drive: { ...p.drive, refreshHz: Math.round(t.figures.refreshHz * 1000) / 1000 } })),
        );
    });
    // ?preset= opens a studio preset on its panel type.
    effect(() => {
      const id = this.preset();
      const found = id && this.studioPresets.hasValue() ? this.studioPresets.value().find((p) => p.id === id) : undefined;
      if (!found) return;
      untracked(() => {
        this.panelTypeId.set(found.panelTypeId);
        this.presetId.set(`studio:${found.id}`);
      });
    });
    // A drift result belongs to the view it was taken of.
    effect(() => {
      this.params();
      this.frame();
      this.scale();
      untracked(() => this.drift.set({ busy: false }));
    });
    effect(
      () =>
        void this.redrawB(
          this.compare(),
          [this.comparePresetId(), this.comparePresetIdC(), this.comparePresetIdD()],
          this.frame(),
          this.scale(),
        ),
    );
    effect(() => this.drawOriginal(this.compare(), this.frame()));
    // The flash check follows the look, the artwork and the distance, a moment after the last change.
    effect(() => {
      const frames = this.frames.hasValue() ? this.frames.value() : [];
      const params = this.params();
      const distance = this.distanceMm();
      clearTimeout(this.flashTimer);
      // A still flickers only under frame-rate control.
      if (frames.length === 0 || (frames.length < 2 && !isFrc(params.drive.dither)))
        return untracked(() => this.flashCheck.set({ busy: false }));
      untracked(() => this.flashCheck.update((f) => ({ ...f, busy: true })));
      this.flashTimer = setTimeout(() => void this.checkFlash(frames, params, distance), 300);
    });
    // The frame-rate-control flicker: every refresh of the cycle, drawn at the refresh rate (up to
    // the screen's), over the glow of the average; turned off, the average comes back.
    effect((onCleanup) => {
      const on = this.showFlicker() && this.frcFlickerHz() !== null && !this.flashBlocked();
      const params = this.params();
      const frame = this.frame();
      const scale = this.scale();
      const frames = this.frames.hasValue() ? this.frames.value() : [];
      if (!on || frames.length === 0) return;
      let stopped = false;
      let raf = 0;
      const preview = untracked(() => this.preview());
      onCleanup(() => {
        stopped = true;
        cancelAnimationFrame(raf);
        untracked(() => preview?.restore(params, scale));
      });
      void untracked(async () => {
        this.sendFrames(this.engineFlash, frames);
        const cycle = await this.engineFlash.cycle(params, frame).catch((err: Error) => (this.status.set(err.message), null));
        if (stopped || !cycle || !preview?.canShowRefreshes) return;
        const period = 1000 / params.drive.refreshHz;
        const start = performance.now();
        let shown = -1;
        const tick = (now: number) => {
          if (stopped) return;
          const r = Math.floor((now - start) / period) % cycle.emissions.length;
          if (r !== shown) {
            preview.showEmission(cycle.emissions[r], params, scale);
            shown = r;
            this.flickerShown.update((n) => n + 1);
          }
          raf = requestAnimationFrame(tick);
        };
        raf = requestAnimationFrame(tick);
      });
    });
  }

  /**
   * Playback: while playing, each frame shows for its own delay (over the speed), then the next;
   * without loop it stops on the last. An RxJS timer made anew for every frame, so a change of
   * speed or frame takes effect at the next step; stopping (or leaving the page) unsubscribes.
   */
  private play(): Subscription {
    const delay = () => ((this.frames.hasValue() ? this.frames.value()[this.frame()]?.delayMs : 0) || 100) / this.speed();
    return defer(() => timer(delay()))
      .pipe(repeat())
      .subscribe(() => {
        const frames = this.frames.hasValue() ? this.frames.value() : [];
        if (!frames.length || (!this.loop() && this.frame() === frames.length - 1)) return this.playing.set(false);
        this.step(1);
      });
  }

  /** Unsaved tuning is never dropped without a word: switching panel type or preset asks first. */
  protected async choosePanelType(id: string, select: MatSelect): Promise<void> {
    if (id === this.panelTypeId()) return;
    if (await this.mayDiscardTuning(`Switch to ${panelTypeById(id)?.name ?? 'another panel type'}?`)) this.panelTypeId.set(id);
    else select.value = this.panelTypeId();
  }

  protected async choosePreset(id: string, select: MatSelect): Promise<void> {
    if (id === this.presetId()) return;
    if (await this.mayDiscardTuning('Open another preset?')) this.presetId.set(id);
    else select.value = this.presetId();
  }

  /** Puts the look back as it was saved (or as the built-in preset has it). */
  protected revert(): void {
    this.params.set(structuredClone(this.defaults()));
  }

  /** What is modified, as the user reads it ("Glow radius 0.25 mm → 0.40 mm"). */
  protected readonly changes = computed(() => paramDiff(this.defaults(), this.params()).map(describeChange));

  private async mayDiscardTuning(title: string): Promise<boolean> {
    const changes = this.changes();
    if (!changes.length) return true;
    const shown = changes.slice(0, 5);
    return this.confirm.ask({
      title,
      consequences: [
        `Your unsaved changes to this look are discarded:`,
        ...shown.map((c) => `• ${c}`),
        ...(changes.length > shown.length ? [`• and ${changes.length - shown.length} more`] : []),
        'Save them first (as a revision or a new preset) to keep them.',
      ],
      action: 'Discard changes and switch',
    });
  }

  /** A revision saved by the save panel replaces its preset in the list. */
  protected revisionSaved(saved: PresetDto): void {
    this.studioPresets.update((list) => list?.map((x) => (x.id === saved.id ? saved : x)));
  }

  /** A preset created from the bench joins the list and opens. */
  protected presetCreated(created: PresetDto): void {
    this.studioPresets.update((list) => [...(list ?? []), created]);
    this.presetId.set(`studio:${created.id}`);
  }

  /** A frame of the live view finished: for the readout, and for tests and the benchmark to wait on. */
  protected onDrawn(ms: number): void {
    this.lastMs.set(ms);
    this.draws.update((n) => n + 1);
  }

  private readonly sent = new WeakMap<BenchEngine, Frame[]>();

  /** Gives an engine the current frames once per artwork. */
  private sendFrames(engine: BenchEngine, frames: Frame[]): void {
    if (this.sent.get(engine) === frames) return;
    engine.setFrames(frames);
    this.sent.set(engine, frames);
  }

  /** Draws the compared looks: B alone, or B, C and D for the 2 × 2 split, one after another on the second engine. */
  private async redrawB(mode: string, ids: string[], frame: number, scale: number): Promise<void> {
    if ((mode !== 'preset' && mode !== 'four') || !this.frames.hasValue()) return;
    this.sendFrames(this.engineB, this.frames.value());
    const targets = mode === 'preset' ? [this.bCanvas()] : [this.bCanvas(), this.cCanvas(), this.dCanvas()];
    for (let k = 0; k < targets.length; k++) {
      const look = this.compareLooks().find((l) => l.id === ids[k]);
      const canvas = targets[k]?.nativeElement;
      if (!look || !canvas) continue;
      const result = await this.engineB.render(look.parameters, frame, scale, true).catch(() => null);
      // null: a newer view replaced this one; that redraw paints all of them.
      if (!result) return;
      if (result.image) putImage(canvas, result.image.data, result.image.width, result.image.height);
    }
  }

  private drawOriginal(mode: string, frame: number): void {
    if (mode !== 'original' || !this.frames.hasValue() || !this.bCanvas()) return;
    const f = this.frames.value()[frame];
    if (f) putImage(this.bCanvas()!.nativeElement, f.image.data, f.image.width, f.image.height);
  }

  /** The cell under the pointer: the box point through the inverted view matrix, then image pixels to cells. */
  protected inspectAt(e: PointerEvent): void {
    const at = this.boxPoint(e);
    const pixel = imagePointAt(this.viewMatrix(), at.x, at.y);
    const p = this.params().cell;
    const { width, height } = this.imageSize();
    const emission = this.preview()?.emission;
    if (!pixel || !emission) return this.inspect.set(null);
    const c = Math.floor((pixel[0] / width) * p.cols);
    const r = Math.floor((pixel[1] / height) * p.rows);
    if (c < 0 || r < 0 || c >= p.cols || r >= p.rows) return this.inspect.set(null);
    const level = emission[r * p.cols + c];
    this.inspect.set({ c, r, level, cd: level * this.params().viewing.peakCdM2 + this.params().viewing.offCdM2 });
  }

  /** A pointer's place in the preview's box, CSS px from its top-left. */
  private boxPoint(e: { clientX: number; clientY: number }): { x: number; y: number } {
    const el = this.stageWrap()!.nativeElement;
    const rect = el.getBoundingClientRect();
    return { x: e.clientX - rect.left - el.clientLeft, y: e.clientY - rect.top - el.clientTop };
  }

  protected setZoomMode(mode: 'fit' | 'pixels' | 'real'): void {
    this.zoom.set(mode);
    this.userView.set(null);
  }

  /** Applies a change of view, keeping some of the image in the box. */
  private changeView(change: (v: ViewState) => ViewState): void {
    this.userView.set(clampView(change(this.view()), this.imageSize(), this.box(), this.baseScale()));
  }

  protected zoomBy(factor: number, at?: { x: number; y: number }): void {
    const { x, y } = at ?? { x: this.box().width / 2, y: this.box().height / 2 };
    this.changeView((v) => zoomAround(v, factor, x, y));
  }

  /** Pointers down on the preview: one drags the view, two pinch it. */
  private readonly pointers = new Map<number, { x: number; y: number }>();

  protected grabView(e: PointerEvent): void {
    if (e.button !== 0 || (e.target as HTMLElement).closest('.divider')) return;
    (e.currentTarget as HTMLElement).setPointerCapture(e.pointerId);
    this.pointers.set(e.pointerId, this.boxPoint(e));
  }

  protected moveView(e: PointerEvent): void {
    this.inspectAt(e);
    const last = this.pointers.get(e.pointerId);
    if (!last) return;
    const now = this.boxPoint(e);
    if (this.pointers.size === 2) {
      const other = [...this.pointers].find(([id]) => id !== e.pointerId)![1];
      const before = Math.hypot(last.x - other.x, last.y - other.y);
      const after = Math.hypot(now.x - other.x, now.y - other.y);
      if (before > 0) this.zoomBy(after / before, { x: (now.x + other.x) / 2, y: (now.y + other.y) / 2 });
    } else {
      this.changeView((v) => ({ ...v, x: v.x + now.x - last.x, y: v.y + now.y - last.y }));
    }
    this.pointers.set(e.pointerId, now);
  }

  protected releaseView(e: PointerEvent): void {
    this.pointers.delete(e.pointerId);
  }

  /** Ctrl (or ⌘) with the wheel, and a trackpad pinch, zoom about the pointer; the wheel alone scrolls the page. */
  protected wheelZoom(e: WheelEvent): void {
    if (!e.ctrlKey && !e.metaKey) return;
    e.preventDefault();
    this.zoomBy(Math.exp(-e.deltaY * 0.002), this.boxPoint(e));
  }

  /** + and − zoom about the middle, the arrows move the view, 0 goes back to the mode's own view. */
  protected keyView(e: KeyboardEvent): void {
    const step = e.shiftKey ? 120 : 40;
    const keys: Record<string, () => void> = {
      '+': () => this.zoomBy(1.25),
      '=': () => this.zoomBy(1.25),
      '-': () => this.zoomBy(0.8),
      '0': () => this.userView.set(null),
      ArrowLeft: () => this.changeView((v) => ({ ...v, x: v.x + step })),
      ArrowRight: () => this.changeView((v) => ({ ...v, x: v.x - step })),
      ArrowUp: () => this.changeView((v) => ({ ...v, y: v.y + step })),
      ArrowDown: () => this.changeView((v) => ({ ...v, y: v.y - step })),
    };
    const act = keys[e.key];
    if (!act || e.target !== e.currentTarget) return;
    e.preventDefault();
    act();
  }

  /** What the left (A) side of a comparison shows: the look being tuned. */
  protected readonly labelA = computed(() => {
    const studio = this.studioPreset();
    const name = studio
      ? `r${studio.revision} · ${studio.name}`
      : (BUILT_IN_PRESETS.find((p) => p.id === this.presetId())?.name ?? 'This look');
    return this.dirty() ? `${name} (edited)` : name;
  });
  /** What the right (B) side shows. */
  protected readonly labelB = computed(() => (this.compare() === 'original' ? 'Original artwork' : this.lookName(this.comparePresetId())));

  protected grabSplit(e: PointerEvent): void {
    e.stopPropagation();
    (e.currentTarget as HTMLElement).setPointerCapture(e.pointerId);
    this.moveSplit(e);
  }

  /** The divider follows the pointer across the whole preview (its own box is only a few pixels wide), in image terms. */
  protected moveSplit(e: PointerEvent): void {
    const divider = e.currentTarget as HTMLElement;
    if (!divider.hasPointerCapture(e.pointerId)) return;
    const at = this.boxPoint(e);
    const pixel = imagePointAt(this.viewMatrix(), at.x, at.y);
    if (pixel) this.split.set(Math.round(Math.min(100, Math.max(0, (pixel[0] / this.imageSize().width) * 100))));
  }

  /** Where the split is in the image, as a place in the preview's box (CSS px); kept a grip's width inside the box so it can always be grabbed. */
  protected readonly dividerX = computed(() => {
    const m = this.viewMatrix();
    const x = m[0] * (this.split() / 100) * this.imageSize().width + m[6];
    return Math.min(this.box().width - 6, Math.max(6, x));
  });

  protected nudgeSplit(e: KeyboardEvent): void {
    const to: Record<string, (v: number) => number> = {
      ArrowLeft: (v) => v - 2,
      ArrowDown: (v) => v - 2,
      ArrowRight: (v) => v + 2,
      ArrowUp: (v) => v + 2,
      PageDown: (v) => v - 10,
      PageUp: (v) => v + 10,
      Home: () => 0,
      End: () => 100,
    };
    const move = to[e.key];
    if (!move) return;
    e.preventDefault();
    this.split.update((v) => Math.min(100, Math.max(0, move(v))));
  }

  protected step(delta: number): void {
    const n = this.frames.hasValue() ? this.frames.value().length : 1;
    this.frame.update((f) => (f + delta + n) % n);
  }

  /** Playback speed: each frame shows for its own delay divided by this. */
  protected readonly speed = signal(1);
  protected readonly speeds = [0.25, 0.5, 1, 2, 4];
  /** Off: playback stops on the last frame. */
  protected readonly loop = signal(true);

  protected togglePlay(): void {
    if (this.playing()) return this.playing.set(false);
    if (this.flashFails() && !this.flashAccepted()) return;
    const count = this.frames.hasValue() ? this.frames.value().length : 1;
    // Played to the end without looping: start again from the first frame.
    if (!this.loop() && this.frame() === count - 1) this.frame.set(0);
    this.playing.set(true);
  }

  /** Where a drag of the card outline started: pointer x and the outline's width then. */
  protected outlineGrab: { x: number; width: number } | null = null;

  protected grabOutline(e: PointerEvent): void {
    (e.target as HTMLElement).setPointerCapture(e.pointerId);
    this.outlineGrab = { x: e.clientX, width: CARD_MM.width * this.pxPerMm() };
  }

  /** The outline follows the pointer: its width is the card's 85.60 mm at the new scale. */
  protected dragOutline(e: PointerEvent): void {
    if (!this.outlineGrab) return;
    this.pxPerMm.set(clampPxPerMm((this.outlineGrab.width + e.clientX - this.outlineGrab.x) / CARD_MM.width));
  }

  protected nudgeOutline(e: KeyboardEvent): void {
    const step = e.shiftKey ? 0.1 : 0.01;
    const delta = e.key === 'ArrowRight' || e.key === 'ArrowUp' ? step : e.key === 'ArrowLeft' || e.key === 'ArrowDown' ? -step : 0;
    if (!delta) return;
    e.preventDefault();
    this.pxPerMm.set(clampPxPerMm(Math.round((this.pxPerMm() + delta) * 100) / 100));
  }

  private flashTimer: ReturnType<typeof setTimeout> | undefined;

  private async checkFlash(frames: Frame[], params: PanelParams, distanceMm: number): Promise<void> {
    this.sendFrames(this.engineFlash, frames);
    try {
      const result = await this.engineFlash.flash(params, distanceMm);
      if (result) this.flashCheck.set({ busy: false, report: result.report });
    } catch (err) {
      this.flashCheck.set({ busy: false, error: (err as Error).message });
    }
  }

  /** A test pattern was added from the analysis: open it on the bench. */
  protected openPattern(id: string): void {
    this.artworks.reload();
    this.artworkId.set(id);
  }

  protected setDistance(value: unknown): void {
    const n = Math.round(Number(value));
    if (!Number.isFinite(n) || n < 50 || n > 100_000) return;
    this.distanceMm.set(n);
    localStorage.setItem('emberline.distanceMm', String(n));
  }

  protected saveCalibration(): void {
    localStorage.setItem('emberline.pxPerMm', String(this.pxPerMm()));
    this.calibrating.set(false);
  }

  protected readonly downloading = signal(false);

  /**
   * Saves the reference render of this view — this frame, at this scale — as a PNG that carries
   * its parameters (iTXt "Emberline parameters", JSON) so the look can be read back from the file.
   */
  protected async downloadPng(): Promise<void> {
    const artwork = this.selected();
    if (!artwork) return;
    this.downloading.set(true);
    try {
      const parameters = this.params();
      const render = await this.renders.render(this.context.studioId(), {
        artworkId: artwork.id,
        parameters,
        scale: this.scale(),
        frame: this.frame(),
      });
      const png = new Uint8Array(await (await this.renders.png(render)).arrayBuffer());
      const tagged = withPngText(png, {
        Software: 'Emberline',
        Title: `${artwork.name} · ${this.labelA()}`,
        'Emberline parameters': JSON.stringify({ panelTypeId: this.panelTypeId(), scale: this.scale(), frame: this.frame(), parameters }),
      });
      const name =
        this.downloadName()
          .replace(/[^\p{L}\p{N} ._-]+/gu, ' ')
          .replace(/\s+/g, '-')
          .replace(/^-|-$/g, '') || 'emberline';
      downloadBlob(`${name}.png`, new Blob([tagged], { type: 'image/png' }));
      this.snackBar.open(`Saved ${name}.png (${render.width} × ${render.height} px, parameters inside).`, undefined, { duration: 4000 });
    } catch (err) {
      this.snackBar.open(apiErrorMessage(err), 'Dismiss', { duration: 8000 });
    } finally {
      this.downloading.set(false);
    }
  }

  /** Asks the server for the reference render of this view and diffs it with the live canvas. */
  protected async checkDrift(): Promise<void> {
    const artwork = this.selected();
    if (!artwork) return;
    // The check compares the frame on screen: it must not move on while the reference renders.
    this.playing.set(false);
    this.drift.set({ busy: true });
    // The result shows above the preview: bring it into view within the preview pane.
    setTimeout(() => this.driftSection()?.nativeElement.scrollIntoView({ block: 'nearest' }));
    try {
      const view = { artworkId: artwork.id, parameters: this.params(), scale: this.scale(), frame: this.frame() };
      const { width, height } = this.uniforms();
      const d = await this.driftCheck.measure(this.context.studioId(), view, { pixels: this.livePixels(), width, height });
      putImage(this.diffCanvas()!.nativeElement, d.heatmap.data, d.heatmap.width, d.heatmap.height);
      this.drift.set({ busy: false, share: d.share, pixels: d.pixels, maxChannel: d.maxChannel });
    } catch (err) {
      this.drift.set({ busy: false, error: apiErrorMessage(err) });
    }
  }

  /** The live view's pixels, top-down RGBA. */
  livePixels(): Uint8Array {
    return this.preview()!.pixels();
  }
}

import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  effect,
  ElementRef,
  inject,
  input,
  output,
  signal,
  viewChild,
} from '@angular/core';
import type { PanelParams } from '@shared/model/parameters';
import { outputUniforms } from '@shared/pipeline/output/uniforms';
import type { Frame } from '@shared/pipeline/types';
import { PanelRenderer } from '../../render/panel-renderer';
import { BenchEngine, type PanelResult } from './bench-engine';

/**
 * A look drawn live: the panel stages in a worker (BenchEngine), the output stages on the GPU
 * (PanelRenderer, made once for its canvas), or the whole pipeline in the worker onto a 2D
 * canvas where WebGL2 is missing. The bench and the share page both show looks through it.
 */
@Component({
  selector: 'em-panel-preview',
  template: `
    <canvas #glCanvas data-testid="live-canvas" [hidden]="usingCpu()" [attr.aria-label]="label()"></canvas>
    <canvas #cpuCanvas data-testid="cpu-canvas" [hidden]="!usingCpu()" [attr.aria-label]="label() + ' (CPU)'"></canvas>
  `,
  styles: `
    :host {
      display: block;
    }
    canvas {
      display: block;
      width: 100%;
      height: auto;
    }
    canvas[hidden] {
      display: none;
    }
    :host(.pixelated) canvas {
      image-rendering: pixelated;
    }
  `,
  host: { '[class.pixelated]': 'pixelated()' },
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PanelPreview {
  readonly frames = input<Frame[] | undefined>();
  readonly params = input.required<PanelParams>();
  readonly frame = input(0);
  /** Output pixels per cell. */
  readonly scale = input(2);
  /** Draw with the CPU even where WebGL2 works (?renderer=cpu). */
  readonly cpuOnly = input(false);
  readonly label = input('Simulated panel');
  /** Magnified: pixels shown as blocks rather than blurred. */
  readonly pixelated = input(false);
  /** A frame finished, with the milliseconds from the change to the frame on screen. */
  readonly drawn = output<number>();
  /** A draw failed: what went wrong ('' once a draw works again). */
  readonly problem = output<string>();

  /** True when the CPU draws (no WebGL2, or asked for). */
  readonly usingCpu = signal(false);

  private readonly glCanvas = viewChild.required<ElementRef<HTMLCanvasElement>>('glCanvas');
  private readonly cpuCanvas = viewChild.required<ElementRef<HTMLCanvasElement>>('cpuCanvas');
  private readonly engine = new BenchEngine();
  private gl: PanelRenderer | null | undefined;
  private lastKey = '';
  private lastResult?: PanelResult;

  constructor() {
    inject(DestroyRef).onDestroy(() => this.engine.dispose());
    effect(() => void this.redraw(this.params(), this.frames(), this.frame(), this.scale()));
  }

  /** The drive level of each cell of the last panel render, row by row (for the inspector). */
  get emission(): Float32Array | undefined {
    return this.lastResult?.emission;
  }

  /** True when the GPU draws, so single refreshes can be shown (the frame-rate-control flicker). */
  get canShowRefreshes(): boolean {
    return !!this.gl;
  }

  /** Shows one emission field (a refresh of the frame-rate-control cycle) over the glow of the last render. */
  showEmission(emission: Float32Array, params: PanelParams, scale: number): void {
    if (!this.gl) return;
    this.gl.uploadEmission(emission);
    this.gl.draw(outputUniforms(params, scale));
  }

  /** Puts the last render back (after the flicker played). */
  restore(params: PanelParams, scale: number): void {
    if (!this.gl || !this.lastResult) return;
    this.gl.upload(this.lastResult.emission, params.cell.cols, params.cell.rows, this.lastResult.glow);
    this.gl.draw(outputUniforms(params, scale));
  }

  /** The pixels on screen, top-down RGBA. */
  pixels(): Uint8Array {
    if (this.gl) return this.gl.readPixels();
    const canvas = this.cpuCanvas().nativeElement;
    return new Uint8Array(canvas.getContext('2d')!.getImageData(0, 0, canvas.width, canvas.height).data.buffer);
  }

  private sentFrames?: Frame[];

  private async redraw(params: PanelParams, frames: Frame[] | undefined, frame: number, scale: number): Promise<void> {
    if (!frames?.length) return;
    if (this.sentFrames !== frames) {
      this.engine.setFrames(frames);
      this.sentFrames = frames;
    }
    this.gl ??= this.cpuOnly() ? null : PanelRenderer.create(this.glCanvas().nativeElement);
    this.usingCpu.set(this.gl === null);
    const started = performance.now();
    const key = panelStageKey(params, frame, frames);
    // Output-stage edits (light, colour, spot) reuse the panel fields: one GPU pass.
    if (this.gl && this.lastResult && key === this.lastKey) {
      this.gl.draw(outputUniforms(params, scale));
      return this.finish(started);
    }
    let result: PanelResult | null;
    try {
      result = await this.engine.render(params, frame, scale, this.gl === null);
    } catch (err) {
      this.problem.emit((err as Error).message);
      return;
    }
    // null: a newer view replaced this one.
    if (!result) return;
    this.problem.emit('');
    this.lastResult = result;
    this.lastKey = key;
    if (this.gl) {
      this.gl.upload(result.emission, params.cell.cols, params.cell.rows, result.glow);
      this.gl.draw(outputUniforms(params, scale));
    } else if (result.image) {
      putImage(this.cpuCanvas().nativeElement, result.image.data, result.image.width, result.image.height);
    }
    this.finish(started);
  }

  /** Waits for the GPU, then records the redraw (User Timing "emberline-redraw", from edit to finished frame). */
  private finish(started: number): void {
    this.gl?.finish();
    const end = performance.now();
    performance.measure('emberline-redraw', { start: started, end });
    this.drawn.emit(end - started);
  }
}

/** Everything the panel-resolution stages and the glow field depend on (not the output stages). */
function panelStageKey(p: PanelParams, frame: number, frames: Frame[]): string {
  // Viewing, the emission colour and the CRT spot act only in the output stages.
  const stages = { source: p.source, drive: p.drive, glass: p.glass, cell: { ...p.cell, spotSigma: 0 }, decayMs: p.emission.decayMs };
  return JSON.stringify({ stages, frame, frames: framesId(frames) });
}

const frameIds = new WeakMap<Frame[], number>();
let nextFramesId = 1;
function framesId(frames: Frame[]): number {
  if (!frameIds.has(frames)) frameIds.set(frames, nextFramesId++);
  return frameIds.get(frames)!;
}

/** Puts RGBA pixels on a 2D canvas at their own size. */
export function putImage(canvas: HTMLCanvasElement, data: Uint8Array | Uint8ClampedArray, width: number, height: number): void {
  canvas.width = width;
  canvas.height = height;
  canvas
    .getContext('2d')!
    .putImageData(new ImageData(new Uint8ClampedArray(data.buffer as ArrayBuffer, data.byteOffset, data.byteLength), width, height), 0, 0);
}

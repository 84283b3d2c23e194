import { createHash } from 'node:crypto';
import os from 'node:os';
import path from 'node:path';
import { MessageChannel } from 'node:worker_threads';
import { Piscina } from 'piscina';
import type { MatchInput, MatchResult } from '@shared/match/fit';
import type { PanelParams } from '@shared/model/parameters';
import { componentSize, glowComponents, glowPlan } from '@shared/pipeline/glow/glow';
import { outputUniforms } from '@shared/pipeline/output/uniforms';
import { standsAlone } from '@shared/pipeline/render';
import type { SpriteSheet } from '@shared/pipeline/sprite-sheet';
import type { Frame, RgbaImage } from '@shared/pipeline/types';
import { AppError } from '../core/app-error';
import { decodeImage, framesOf } from './decode';
import { joinPng, type PngBand } from './png';
import { previewGrid, shared } from './pool-tasks';
import { SharedBufferPool } from './shared-buffers';
import { RenderTaskQueue, withOrder, type TaskOrder } from './task-queue';

/** The pool's tasks (pool-tasks.ts). */
type TaskName = 'demand' | 'panel' | 'glowStep' | 'band' | 'match' | 'rectifyPhoto' | 'fail';

/** [from, to) ranges splitting 0 … n into at most `count` nearly equal bands (none empty). */
function bandsOf(n: number, count: number): [number, number][] {
  const k = Math.max(1, Math.min(count, n));
  return Array.from({ length: k }, (_, i) => [Math.floor((i * n) / k), Math.floor(((i + 1) * n) / k)]);
}

/** Largest output image a reference render may produce. */
export const MAX_OUTPUT_PIXELS = 24_000_000;

/** What a reference render is asked for. */
export interface RenderRequest {
  input: Buffer;
  /** When the input is a sprite sheet: how to cut it into frames. */
  sheet?: SpriteSheet | null;
  parameters: PanelParams;
  scale: number;
  frame: number;
}

/** How a render is run: in how many output bands (default: one a thread), and whether it is background work (an export), which waits while interactive renders are queued. */
export interface RenderOptions {
  bands?: number;
  background?: boolean;
}

/** A finished render. */
export interface RenderedPng {
  png: Buffer;
  width: number;
  height: number;
}

export interface RenderEngineOptions {
  /** Worker threads; default: one per core. */
  threads?: number;
  /** Renders waiting or running before new ones are refused with 503 render_busy. */
  maxPending?: number;
  /** Budget of the decoded-frames cache, in MB. */
  frameCacheMb?: number;
}

/** Decoded frames in shared memory, kept by content hash (LRU, bounded in bytes). */
class FrameCache {
  private readonly entries = new Map<string, { frames: Frame[]; bytes: number }>();
  private bytes = 0;

  constructor(private readonly budget: number) {}

  async get(input: Buffer, sheet: SpriteSheet | null | undefined): Promise<Frame[]> {
    const key = `${createHash('sha256').update(input).digest('hex')}/${JSON.stringify(sheet ?? null)}`;
    const hit = this.entries.get(key);
    if (hit) {
      this.entries.delete(key);
      this.entries.set(key, hit);
      return hit.frames;
    }
    const frames = framesOf(await decodeImage(input, undefined, sheet), sheet).map((f) => ({
      delayMs: f.delayMs,
      image: { width: f.image.width, height: f.image.height, data: shared(f.image.data as Uint8Array) },
    }));
    const bytes = frames.reduce((n, f) => n + f.image.data.byteLength, 0);
    if (bytes <= this.budget) {
      this.entries.set(key, { frames, bytes });
      this.bytes += bytes;
      for (const [k, e] of this.entries) {
        if (this.bytes <= this.budget) break;
        this.entries.delete(k);
        this.bytes -= e.bytes;
      }
    }
    return frames;
  }

  get sizeBytes(): number {
    return this.bytes;
  }
}

/**
 * Reference renders on a pool of worker threads (piscina), sized to the cores. The HTTP thread
 * decodes (sharp, on libvips' own threads), checks sizes and joins the PNG file; every pipeline
 * stage runs in a worker. One render is split in steps — the panel stages (fit and tone in bands
 * of grid rows for a frame that stands alone), the glow components blurred in bands, then the
 * output stages in row bands (each summing the glow rows it reads and deflating its rows for the
 * PNG file), one band a thread — so a single large render uses every core, and the pixels equal a
 * single-thread render (each output row depends only on the inputs). The pool's queue serves
 * interactive renders before background ones (exports), and earlier renders' steps first
 * (task-queue.ts).
 */
export class RenderEngine {
  readonly threads: number;
  private readonly pool: Piscina;
  private readonly maxPending: number;
  private readonly frames: FrameCache;
  private pending = 0;
  /** Pieces of work taken so far (renders, fits, previews): the queue runs earlier ones' tasks first. */
  private works = 0;
  /** The emission, glow, output and demand arrays of renders, reused (up to 256 MiB held while idle). */
  private readonly buffers = new SharedBufferPool(256 * 1024 * 1024);

  constructor(options: RenderEngineOptions = {}) {
    this.threads = options.threads ?? Math.max(1, os.availableParallelism());
    this.maxPending = options.maxPending ?? this.threads * 8;
    this.frames = new FrameCache((options.frameCacheMb ?? 256) * 1024 * 1024);
    this.pool = new Piscina({
      filename: path.join(__dirname, 'pool-worker.cjs'),
      minThreads: this.threads,
      maxThreads: this.threads,
      idleTimeout: 60_000,
      taskQueue: new RenderTaskQueue(),
    });
  }

  /** Renders waiting or running now. */
  get load(): number {
    return this.pending;
  }

  /** Bytes held by the decoded-frames cache. */
  get cachedFrameBytes(): number {
    return this.frames.sizeBytes;
  }

  /** Checks the request's output size before anything is queued (400 naming the limit). */
  static check(req: Pick<RenderRequest, 'parameters' | 'scale'>): { width: number; height: number } {
    const u = outputUniforms(req.parameters, req.scale);
    if (u.cellH < 1)
      throw new AppError(
        400,
        'invalid_input',
        `scale ${req.scale} makes cells ${u.cellH.toFixed(2)} px tall; use a scale of at least ${Math.ceil(req.parameters.cell.pitchXMm / req.parameters.cell.pitchYMm)}.`,
      );
    if (u.width * u.height > MAX_OUTPUT_PIXELS) {
      throw new AppError(
        400,
        'output_too_large',
        `The render would be ${u.width} × ${u.height} pixels; the limit is ${MAX_OUTPUT_PIXELS}. Lower the scale.`,
      );
    }
    return { width: u.width, height: u.height };
  }

  /** Decoded frames of an input (cached), for routes that serve them. */
  decodedFrames(input: Buffer, sheet?: SpriteSheet | null): Promise<Frame[]> {
    return this.frames.get(input, sheet);
  }

  /** A full render: decode (cached), panel stages and glow, output stages in bands, each band deflated there; the PNG joined here. */
  async render(req: RenderRequest, options: RenderOptions = {}): Promise<RenderedPng> {
    return this.withRender(req, options, true, ({ width, height }, bands) => ({ png: joinPng(width, height, bands), width, height }));
  }

  /** A full render as raw RGBA (its own copy), for work that puts renders together (comparison sheets). */
  async renderImage(req: RenderRequest, options: RenderOptions = {}): Promise<RgbaImage> {
    return this.withRender(req, options, false, ({ width, height }, _bands, out) => ({ width, height, data: new Uint8Array(out!) }));
  }

  /**
   * Renders into reused shared buffers and hands the result to `use` before the buffers go back:
   * each band's PNG data when `png` is asked for, else the output image.
   */
  private async withRender<T>(
    req: RenderRequest,
    options: RenderOptions,
    png: boolean,
    use: (size: { width: number; height: number }, bands: PngBand[], out: Uint8Array | null) => T,
  ): Promise<T> {
    const { width, height } = RenderEngine.check(req);
    if (this.pending >= this.maxPending) {
      throw new AppError(503, 'render_busy', `The renderer has ${this.pending} renders in hand, its limit. Try again in a few seconds.`, {
        retryAfterSeconds: 2,
      });
    }
    this.pending++;
    const order: TaskOrder = { background: options.background ?? false, work: this.works++ };
    try {
      const frames = await this.frames.get(req.input, req.sheet);
      if (req.frame >= frames.length)
        throw new AppError(400, 'invalid_input', `frame must be from 0 to ${frames.length - 1} for this image, got ${req.frame}.`);
      const { cell, glass } = req.parameters;
      const plan = glowPlan(cell, glass);
      const components = glowComponents(plan).map((c) => componentSize(cell, c));
      const held: SharedArrayBuffer[] = [];
      const hold = (bytes: number) => {
        const b = this.buffers.acquire(bytes);
        held.push(b);
        return b;
      };
      try {
        const emission = new Float32Array(hold(cell.cols * cell.rows * 4));
        const componentData = components.map((c) => new Float32Array(hold(c.width * c.height * 4)));
        // A PNG file's bands are composed straight into the PNG writer's buffers: no output image.
        const out = png ? null : new Uint8Array(hold(width * height * 4));
        const threads = Math.max(1, options.bands ?? this.threads);
        const panelTask = { frames, parameters: req.parameters, frame: req.frame, emissionOut: emission };
        if (standsAlone(frames, req.parameters)) {
          // Fit and tone in bands of grid rows; then levels (error diffusion runs in cell order)
          // and the rest of the panel stages in one task.
          const demand = new Float32Array(hold(cell.cols * cell.rows * 4));
          await this.runAll(
            'demand',
            bandsOf(cell.rows, threads).map(([r0, r1]) => ({ ...panelTask, band: { r0, r1 }, demandOut: demand })),
            order,
          );
          await this.run('panel', { ...panelTask, demand }, order);
        } else {
          await this.run('panel', panelTask, order);
        }
        // The glow components blurred in two steps, each split in bands across the threads:
        // across (row bands), then down (column bands). Each output band then sums the glow
        // rows it reads and composes its rows.
        const glowTask = { emission, parameters: req.parameters, components: componentData };
        const steps = (step: 'across' | 'down', extent: (c: { width: number; height: number }) => number) =>
          components.flatMap((c, k) => bandsOf(extent(c), threads).map(([from, to]) => ({ ...glowTask, step, k, from, to })));
        await this.runAll(
          'glowStep',
          steps('across', (c) => c.height),
          order,
        );
        await this.runAll(
          'glowStep',
          steps('down', (c) => c.width),
          order,
        );
        const pngBands = await this.runAll(
          'band',
          bandsOf(height, threads).map(([y0, y1]) => ({
            emission,
            components: componentData,
            parameters: req.parameters,
            scale: req.scale,
            rows: { y0, y1 },
            out,
          })),
          order,
        );
        return use({ width, height }, pngBands as PngBand[], out);
      } finally {
        this.buffers.release(...held);
      }
    } finally {
      this.pending--;
    }
  }

  /**
   * Runs tasks at once and waits for every one to settle before answering: a failed task must not
   * leave another still writing into buffers that go back to the pool.
   */
  private async runAll(name: TaskName, tasks: object[], order?: TaskOrder): Promise<unknown[]> {
    const settled = await Promise.allSettled(tasks.map((t) => this.run(name, t, order)));
    const failed = settled.find((r) => r.status === 'rejected');
    if (failed) throw failed.reason;
    return settled.map((r) => (r as PromiseFulfilledResult<unknown>).value);
  }

  /**
   * Runs a named task, queued by `order` (else as interactive work of its own); a worker's error
   * comes back as 500 render_failed, and the pool replaces a dead worker.
   */
  async run(name: TaskName, task: object, order: TaskOrder = { background: false, work: this.works++ }): Promise<unknown> {
    try {
      return await this.pool.run(withOrder(task, order), { name });
    } catch (err) {
      if (err instanceof AppError) throw err;
      console.error(`[render] a ${name} task failed: ${(err as Error).message}`);
      throw new AppError(
        500,
        'render_failed',
        'The render failed on our side and was logged. Try again; if it keeps failing, tell us which artwork and preset.',
      );
    }
  }

  /**
   * Fits a panel type to a photo of the match pattern on one pool thread (the fit is a chain of
   * small renders, each depending on the last), reporting progress as it goes. Answers the result,
   * or the refusal's words for a photo that cannot be fitted.
   */
  async fitMatch(
    input: MatchInput,
    onProgress: (share: number, step: string) => void,
  ): Promise<{ result: MatchResult } | { refusal: string }> {
    const channel = new MessageChannel();
    channel.port1.on('message', (m: { share: number; step: string }) => onProgress(m.share, m.step));
    try {
      const photo = { ...input.photo, data: shared(input.photo.data as Uint8Array) };
      return (await this.pool.run(
        withOrder({ input: { ...input, photo }, port: channel.port2 }, { background: false, work: this.works++ }),
        { name: 'match', transferList: [channel.port2] },
      )) as { result: MatchResult } | { refusal: string };
    } catch (err) {
      console.error(`[render] a match fit failed: ${(err as Error).message}`);
      throw new AppError(
        500,
        'render_failed',
        'The fit failed on our side and was logged. Try again; if it keeps failing, tell us which photo.',
      );
    } finally {
      channel.port1.close();
    }
  }

  /** A match photo resampled onto the panel's grid through its marks, `scale` px a pitch (in row bands across the pool). */
  async rectifyPhoto(photo: RgbaImage, marks: [number, number][], base: PanelParams, scale: number): Promise<RgbaImage> {
    const { width, height } = previewGrid(base, scale);
    const out = new Uint8Array(new SharedArrayBuffer(width * height * 4));
    const task = { photo: { ...photo, data: shared(photo.data as Uint8Array) }, marks, base, scale, out };
    await this.runAll(
      'rectifyPhoto',
      bandsOf(height, this.threads).map((rows) => ({ ...task, rows })),
      { background: false, work: this.works++ },
    );
    return { width, height, data: out };
  }

  /** Stops the worker threads. */
  async close(): Promise<void> {
    await this.pool.destroy();
  }
}

import type { PanelParams } from '@shared/model/parameters';
import type { Frame } from '@shared/pipeline/types';
import type { WorkerRequest, WorkerResult } from './bench-messages';

export type PanelResult = Extract<WorkerResult, { type: 'result' }>;
type Job = {
  req: DistributiveOmit<Exclude<WorkerRequest, { type: 'frames' }>, 'id'>;
  resolve: (r: WorkerResult | null) => void;
  reject: (e: Error) => void;
};
type DistributiveOmit<T, K extends keyof T> = T extends unknown ? Omit<T, K> : never;

/**
 * Talks to the bench worker: one render in flight at a time; while it runs only the newest
 * request waits, so dragging a slider never queues stale work.
 */
export class BenchEngine {
  private readonly worker = new Worker(new URL('./bench.worker', import.meta.url), { type: 'module' });
  private nextId = 1;
  private busy = false;
  private pending?: Job;
  private current?: { id: number; resolve: (r: WorkerResult | null) => void; reject: (e: Error) => void };

  constructor() {
    this.worker.addEventListener('message', ({ data }: MessageEvent<WorkerResult>) => {
      const current = this.current;
      if (!current || data.id !== current.id) return;
      this.current = undefined;
      this.busy = false;
      if (data.type === 'error') current.reject(new Error(data.message));
      else current.resolve(data);
      this.startPending();
    });
  }

  setFrames(frames: Frame[]): void {
    // Copies, so the page keeps its own frames for the A/B original view.
    const copies = frames.map((f) => ({
      delayMs: f.delayMs,
      image: { width: f.image.width, height: f.image.height, data: Uint8Array.from(f.image.data) },
    }));
    this.post(
      { type: 'frames', frames: copies },
      copies.map((f) => f.image.data.buffer),
    );
  }

  /** Resolves with the result, or null when a newer request replaced this one before it ran. */
  render(params: PanelParams, frame: number, scale: number, compose: boolean): Promise<PanelResult | null> {
    return this.queue({ type: 'render', params, frame, scale, compose }) as Promise<PanelResult | null>;
  }

  /** Each refresh of a frame's frame-rate-control cycle, as emission (same queue). */
  async cycle(params: PanelParams, frame: number): Promise<Extract<WorkerResult, { type: 'cycle' }> | null> {
    return (await this.queue({ type: 'cycle', params, frame })) as Extract<WorkerResult, { type: 'cycle' }> | null;
  }

  /** The flash check of the whole animation through a look (same queue: a newer request replaces a waiting one). */
  async flash(params: PanelParams, distanceMm: number): Promise<Extract<WorkerResult, { type: 'flash' }> | null> {
    return (await this.queue({ type: 'flash', params, distanceMm })) as Extract<WorkerResult, { type: 'flash' }> | null;
  }

  /** Legibility, light and burn-in for the view (same queue). */
  async report(params: PanelParams, frame: number, hours: number): Promise<Extract<WorkerResult, { type: 'report' }> | null> {
    return (await this.queue({ type: 'report', params, frame, hours })) as Extract<WorkerResult, { type: 'report' }> | null;
  }

  private queue(req: Job['req']): Promise<WorkerResult | null> {
    return new Promise((resolve, reject) => {
      this.pending?.resolve(null);
      this.pending = { req, resolve, reject };
      this.startPending();
    });
  }

  dispose(): void {
    this.worker.terminate();
  }

  private startPending(): void {
    if (this.busy || !this.pending) return;
    const { req, resolve, reject } = this.pending;
    this.pending = undefined;
    const id = this.nextId++;
    this.busy = true;
    this.current = { id, resolve, reject };
    this.post({ ...req, id } as WorkerRequest);
  }

  private post(msg: WorkerRequest, transfer: Transferable[] = []): void {
    this.worker.postMessage(msg, transfer);
  }
}

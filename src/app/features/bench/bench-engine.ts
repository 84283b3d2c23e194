import type { PanelParams } from '../../../../shared/model/parameters';
import type { Frame } from '../../../../shared/pipeline/types';
import type { WorkerRequest, WorkerResult } from './bench-messages';

export type PanelResult = Extract<WorkerResult, { type: 'result' }>;

/**
 * Talks to the bench worker: one render in flight at a time; while it runs only the newest
 * request waits, so dragging a slider never queues stale work.
 */
export class BenchEngine {
  private readonly worker = new Worker(new URL('./bench.worker', import.meta.url), { type: 'module' });
  private nextId = 1;
  private busy = false;
  private pending?: { req: Omit<Extract<WorkerRequest, { type: 'render' }>, 'id' | 'type'>; resolve: (r: PanelResult | null) => void; reject: (e: Error) => void };
  private current?: { id: number; resolve: (r: PanelResult | null) => void; reject: (e: Error) => void };

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
    const copies = frames.map((f) => ({ delayMs: f.delayMs, image: { width: f.image.width, height: f.image.height, data: Uint8Array.from(f.image.data) } }));
    this.post({ type: 'frames', frames: copies }, copies.map((f) => f.image.data.buffer));
  }

  /** Resolves with the result, or null when a newer request replaced this one before it ran. */
  render(params: PanelParams, frame: number, scale: number, compose: boolean): Promise<PanelResult | null> {
    return new Promise((resolve, reject) => {
      this.pending?.resolve(null);
      this.pending = { req: { params, frame, scale, compose }, resolve, reject };
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
    this.post({ type: 'render', id, ...req });
  }

  private post(msg: WorkerRequest, transfer: Transferable[] = []): void {
    this.worker.postMessage(msg, transfer);
  }
}

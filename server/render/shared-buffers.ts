/**
 * SharedArrayBuffers handed back after a render and given out again, by size. Writing into fresh
 * memory costs a page fault per 4 KiB — on this kind of small virtual machine about 4 ms per MiB,
 * more than the stage that fills it — so the engine reuses the few sizes its renders need.
 * Holds at most `budgetBytes` while idle; beyond that a released buffer is left to the GC.
 */
export class SharedBufferPool {
  private readonly free = new Map<number, SharedArrayBuffer[]>();
  private held = 0;

  constructor(private readonly budgetBytes: number) {}

  acquire(bytes: number): SharedArrayBuffer {
    const buffer = this.free.get(bytes)?.pop();
    if (!buffer) return new SharedArrayBuffer(bytes);
    this.held -= bytes;
    return buffer;
  }

  release(...buffers: SharedArrayBuffer[]): void {
    for (const buffer of buffers) {
      if (this.held + buffer.byteLength > this.budgetBytes) continue;
      const list = this.free.get(buffer.byteLength) ?? [];
      list.push(buffer);
      this.free.set(buffer.byteLength, list);
      this.held += buffer.byteLength;
    }
  }

  /** Bytes waiting to be given out again. */
  get heldBytes(): number {
    return this.held;
  }
}

import type { Frame } from './types';

/**
 * Frames sent as raw RGBA one after another (what `…/frames` answers) back into frames, refused
 * when the bytes do not add up to frames × width × height × 4.
 */
export function unpackFrames(buffer: ArrayBuffer, a: { width: number; height: number; delaysMs: readonly number[] }): Frame[] {
  const size = a.width * a.height * 4;
  if (buffer.byteLength !== size * a.delaysMs.length)
    throw new Error(`The artwork's frames arrived incomplete (${buffer.byteLength} of ${size * a.delaysMs.length} bytes).`);
  return a.delaysMs.map((delayMs, k) => ({
    image: { width: a.width, height: a.height, data: new Uint8Array(buffer, k * size, size) },
    delayMs,
  }));
}

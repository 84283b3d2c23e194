import type { Frame, RgbaImage } from './types';

/** How to cut a sprite sheet into animation frames: a grid of equal cells, read row by row. */
export interface SpriteSheet {
  frameWidth: number;
  frameHeight: number;
  frameDelayMs: number;
}

/**
 * Bounds on what a sheet may be cut into, checked before any frame is made: a 1 × 1 grid over a
 * large one-colour PNG would otherwise make millions of frames from a few kilobytes.
 */
export const SHEET_LIMITS = {
  /** Smallest frame side in pixels (a 4 × 4 glyph is the smallest cell pixel art uses in practice). */
  minFrameSide: 4,
  /** Most frames a sheet may yield (the same cap as an animation's frame count). */
  maxFrames: 240,
};

/**
 * Checks a sheet grid against the image size and the limits; throws RangeError with a message
 * that names the limit and how to fix it. Runs on the header's size, before slicing.
 */
export function checkSpriteSheet(width: number, height: number, sheet: SpriteSheet, limits = SHEET_LIMITS): number {
  const { frameWidth: w, frameHeight: h } = sheet;
  if (w < limits.minFrameSide || h < limits.minFrameSide) {
    throw new RangeError(`frames of ${w} × ${h} pixels are smaller than the minimum of ${limits.minFrameSide} × ${limits.minFrameSide}`);
  }
  if (width % w !== 0 || height % h !== 0) {
    throw new RangeError(`a ${width} × ${height} sheet does not divide into ${w} × ${h} frames`);
  }
  const count = (width / w) * (height / h);
  if (count > limits.maxFrames) {
    throw new RangeError(
      `a ${width} × ${height} sheet cut into ${w} × ${h} frames makes ${count} frames; the limit is ${limits.maxFrames}`,
    );
  }
  return count;
}

/** Cuts a sheet into frames (left to right, top to bottom); throws RangeError if the grid does not fit the limits. */
export function sliceSpriteSheet(image: RgbaImage, sheet: SpriteSheet, limits = SHEET_LIMITS): Frame[] {
  checkSpriteSheet(image.width, image.height, sheet, limits);
  const { frameWidth: w, frameHeight: h } = sheet;
  const frames: Frame[] = [];
  for (let fy = 0; fy < image.height / h; fy++) {
    for (let fx = 0; fx < image.width / w; fx++) {
      const data = new Uint8Array(w * h * 4);
      for (let y = 0; y < h; y++) {
        const from = ((fy * h + y) * image.width + fx * w) * 4;
        data.set(image.data.subarray(from, from + w * 4), y * w * 4);
      }
      frames.push({ image: { width: w, height: h, data }, delayMs: sheet.frameDelayMs });
    }
  }
  return frames;
}

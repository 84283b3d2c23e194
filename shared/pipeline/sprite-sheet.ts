import type { Frame, RgbaImage } from './types';

/** How to cut a sprite sheet into animation frames: a grid of equal cells, read row by row. */
export interface SpriteSheet {
  frameWidth: number;
  frameHeight: number;
  frameDelayMs: number;
}

/** Cuts a sheet into frames (left to right, top to bottom); throws RangeError if the grid does not fit. */
export function sliceSpriteSheet(image: RgbaImage, sheet: SpriteSheet): Frame[] {
  const { frameWidth: w, frameHeight: h } = sheet;
  if (image.width % w !== 0 || image.height % h !== 0) {
    throw new RangeError(`a ${image.width} × ${image.height} sheet does not divide into ${w} × ${h} frames`);
  }
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

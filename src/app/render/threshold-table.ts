import { ChannelCoder, PixelCoder } from '@shared/pipeline/output/compose';
import type { OutputUniforms } from '@shared/pipeline/output/uniforms';

/** Texels of the threshold table: one per code value 0–255. */
export const THRESHOLD_CODES = 256;

/** Largest float32: ±∞ thresholds (a channel the colour never lights) become ±this. */
const FLOAT32_MAX = 3.4028234663852886e38;

/**
 * The output stage after v as the CPU composer evaluates it (compose.ts ChannelCoder): per
 * channel, the relative luminance v from which the channel shows code c — light, exposure, soft
 * knee and sRGB encode folded into 255 thresholds. Texel c holds (red, green, blue) thresholds of
 * code c (texel 0 is never read). The shader finds the largest c with v ≥ threshold by bisection,
 * so its codes equal the CPU's wherever its v does (to float32 rounding of v and the thresholds),
 * instead of interpolating a sampled curve between codes.
 */
export function thresholdTable(u: OutputUniforms): Float32Array {
  const out = new Float32Array(THRESHOLD_CODES * 4);
  u.colour.forEach((colour, channel) => {
    const { v } = new ChannelCoder(colour, u);
    for (let c = 1; c < THRESHOLD_CODES; c++) out[c * 4 + channel] = Math.max(-FLOAT32_MAX, Math.min(FLOAT32_MAX, v[c]));
  });
  return out;
}

/** Texels across the word table, and its cells: 2¹⁶ (256 × 256, a quarter of the CPU's, so an edit uploads 256 KiB). */
export const WORD_TABLE_WIDTH = 256;
const WORD_TABLE_CELLS = 1 << 16;

/**
 * The CPU composer's pixel table (compose.ts PixelCoder) as RGBA8 texels: for v in [0, vMax) the
 * shader reads cell ⌊v · perV⌋. A texel with alpha 255 is the pixel; alpha 0 marks a cell next to
 * a code threshold, whose codes are a lower bound the shader steps up past the thresholds v has
 * reached (one step, rarely two). One fetch a pixel instead of a 24-fetch bisection, and the
 * same codes: a cell is final only when no threshold lies within one cell of it, which covers
 * v · perV rounding either way in float32.
 */
export function wordTable(u: OutputUniforms): {
  texels: Uint8Array;
  width: number;
  height: number;
  perV: number;
  vMax: number;
  /** The codes of v = 0 (a dark cell with no glow: common) and of every v ≥ vMax (no threshold lies beyond vMax). */
  zeroCodes: number[];
  topCodes: number[];
} {
  const coder = new PixelCoder(u, WORD_TABLE_CELLS);
  // The coder's last cell is there for v · perV rounding up to the cell count; the shader clamps instead.
  const cells = coder.table.length - 1;
  const height = cells / WORD_TABLE_WIDTH;
  return {
    texels: new Uint8Array(coder.table.buffer, coder.table.byteOffset, cells * 4),
    width: WORD_TABLE_WIDTH,
    height,
    perV: coder.perV,
    vMax: coder.vMax,
    zeroCodes: coder.channels.map((c) => c.code(0)),
    topCodes: coder.channels.map((c) => c.code(coder.vMax)),
  };
}

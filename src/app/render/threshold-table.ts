import { ChannelCoder } from '@shared/pipeline/output/compose';
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

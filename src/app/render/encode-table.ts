import { srgbEncode } from '../../../shared/color/srgb';
import { softKnee } from '../../../shared/pipeline/output/formulas';
import type { OutputUniforms } from '../../../shared/pipeline/output/uniforms';

/** Entries of the per-channel encode table (64 × 64 texels), and the v it spans. */
export const ENCODE_WIDTH = 64;
export const ENCODE_STEPS = ENCODE_WIDTH * ENCODE_WIDTH;
export const ENCODE_V_MAX = 4;

/**
 * The output stage after v, per channel: display = (colour·(v·peak + off) + Y_c·ambient)·gain,
 * soft knee, sRGB encode — the formulas of shared/pipeline/output — sampled at ENCODE_STEPS
 * values of v in [0, ENCODE_V_MAX]. Linear interpolation between 1/1024 steps of v is within
 * 0.1 of a code value of the exact curve (the sRGB toe is linear, so its kink is kept exactly
 * only to that tolerance).
 */
export function encodeTable(u: OutputUniforms): Float32Array {
  const out = new Float32Array(ENCODE_STEPS * 4);
  const ambient = u.colourY * u.ambientCdM2;
  for (let i = 0; i < ENCODE_STEPS; i++) {
    const v = (i / (ENCODE_STEPS - 1)) * ENCODE_V_MAX;
    const lum = v * u.peakCdM2 + u.offCdM2;
    for (let c = 0; c < 3; c++) out[i * 4 + c] = srgbEncode(softKnee((u.colour[c] * lum + ambient) * u.gain, u.knee));
    out[i * 4 + 3] = 1;
  }
  return out;
}

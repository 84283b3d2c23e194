import type { PanelParams } from '../model/parameters';
import { glowField, glowPlan } from '../pipeline/glow/glow';
import { apertureTaps, glowTaps, lineTaps } from '../pipeline/output/compose';
import { outputUniforms } from '../pipeline/output/uniforms';
import type { Rectified } from './photo';

/** Output pixels [x0, x1) × [y0, y1). */
export interface PixelWindow {
  x0: number;
  y0: number;
  x1: number;
  y1: number;
}

/**
 * The pipeline's light for a panel showing `levels` (drive level per cell, cols × rows of `p`),
 * before display encoding: relative luminance per output pixel at `scale` pixels a pitch (or of a
 * window of them), where 1 is a fully lit aperture. The same stages as a reference render (aperture and line taps, the
 * glow field), kept in floating point: a photo is compared with light, not with 8-bit codes, and
 * a fit needs a model that moves smoothly with its parameters.
 */
export function modelLight(levels: Float32Array, p: PanelParams, scale: number, window?: PixelWindow): Rectified {
  const u = outputUniforms(p, scale);
  const { cols, rows } = u;
  const { x0, y0, x1, y1 } = window ?? { x0: 0, y0: 0, x1: u.width, y1: u.height };
  const width = x1 - x0;
  const height = y1 - y0;
  const glow = glowField(levels, p.cell, glowPlan(p.cell, p.glass));
  // Taps for the whole image, read from the window's first column and row on.
  const xs = apertureTaps(u.width, cols, u.cellW, u.fillX);
  const ys = u.crt ? lineTaps(u.height, rows, u.cellH, u.spotSigmaPx, u.lineCentred) : apertureTaps(u.height, rows, u.cellH, u.fillY);
  const gx = glowTaps(u.width, glow.width, u.cellW, u.glowOversample);
  const gy = glowTaps(u.height, glow.height, u.cellH, u.glowOversample);
  // Each panel row's profile across the output width, once.
  const profiles = new Float32Array(rows * width);
  for (let r = 0; r < rows; r++) {
    for (let x = 0; x < width; x++) {
      let s = 0;
      const t = (x + x0) * xs.stride;
      for (let k = 0; k < xs.stride; k++) s += xs.weight[t + k] * levels[r * cols + xs.index[t + k]];
      profiles[r * width + x] = s;
    }
  }
  const data = new Float32Array(width * height);
  for (let y = 0; y < height; y++) {
    const o = y * width;
    const ty = y + y0;
    for (let k = 0; k < ys.stride; k++) {
      const wy = ys.weight[ty * ys.stride + k];
      if (wy === 0) continue;
      const base = ys.index[ty * ys.stride + k] * width;
      for (let x = 0; x < width; x++) data[o + x] += u.directShare * wy * profiles[base + x];
    }
    const g0 = gy.index[ty * 2] * glow.width;
    const g1 = gy.index[ty * 2 + 1] * glow.width;
    const t0 = gy.weight[ty * 2];
    const t1 = gy.weight[ty * 2 + 1];
    for (let x = 0; x < width; x++) {
      const a = gx.index[(x + x0) * 2];
      const b = gx.index[(x + x0) * 2 + 1];
      const wa = gx.weight[(x + x0) * 2];
      const wb = gx.weight[(x + x0) * 2 + 1];
      data[o + x] += t0 * (glow.data[g0 + a] * wa + glow.data[g0 + b] * wb) + t1 * (glow.data[g1 + a] * wa + glow.data[g1 + b] * wb);
    }
  }
  return { width, height, data };
}

/** A separable Gaussian blur of σ samples (taps to 3σ, renormalised at the edges): the camera's own blur. */
export function gaussianBlur(image: Rectified, sigma: number): Rectified {
  if (!(sigma > 0.05)) return image;
  const reach = Math.ceil(3 * sigma);
  const taps = Float64Array.from({ length: 2 * reach + 1 }, (_, k) => Math.exp(-((k - reach) ** 2) / (2 * sigma * sigma)));
  const { width, height, data } = image;
  // Sum of the taps that fall inside a line of n samples, for sample i (edge renormalisation).
  const norms = (n: number) =>
    Float64Array.from({ length: n }, (_, i) => {
      let w = 0;
      for (let k = -reach; k <= reach; k++) if (i + k >= 0 && i + k < n) w += taps[k + reach];
      return 1 / w;
    });
  const across = new Float32Array(data.length);
  const nx = norms(width);
  for (let y = 0; y < height; y++) {
    const o = y * width;
    for (let x = 0; x < width; x++) {
      const k0 = Math.max(-reach, -x);
      const k1 = Math.min(reach, width - 1 - x);
      let s = 0;
      for (let k = k0; k <= k1; k++) s += taps[k + reach] * data[o + x + k];
      across[o + x] = s * nx[x];
    }
  }
  // Down: whole rows at a time, so memory is read in order.
  const out = new Float32Array(data.length);
  const ny = norms(height);
  for (let y = 0; y < height; y++) {
    const o = y * width;
    const k0 = Math.max(-reach, -y);
    const k1 = Math.min(reach, height - 1 - y);
    for (let k = k0; k <= k1; k++) {
      const t = taps[k + reach] * ny[y];
      const src = (y + k) * width;
      for (let x = 0; x < width; x++) out[o + x] += t * across[src + x];
    }
  }
  return { width, height, data: out };
}

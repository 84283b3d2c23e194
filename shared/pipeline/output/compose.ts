import { srgbDecode } from '../../color/srgb';
import type { Field, RgbaImage } from '../types';
import { apertureCoverage, lineCoverage } from './formulas';
import type { OutputUniforms } from './uniforms';

/** Per output column or row: which cells (or lines) touch it and with what coverage. */
export interface Taps {
  index: Int32Array;
  weight: Float32Array;
  /** Taps per pixel (fixed stride). */
  stride: number;
}

/** Exact aperture coverage of each output pixel along one axis (≤ 2 cells a pixel when cells are ≥ 1 px). */
export function apertureTaps(pixels: number, cells: number, size: number, fill: number): Taps {
  const stride = Math.ceil(1 / size) + 1;
  const index = new Int32Array(pixels * stride);
  const weight = new Float32Array(pixels * stride);
  for (let p = 0; p < pixels; p++) {
    const first = Math.floor(p / size);
    for (let k = 0; k < stride; k++) {
      const c = Math.min(first + k, cells - 1);
      index[p * stride + k] = c;
      weight[p * stride + k] = first + k < cells ? apertureCoverage(p, c, size, fill) : 0;
    }
  }
  return { index, weight, stride };
}

/** CRT line-profile weights of each output row (lines within 4σ). */
export function lineTaps(pixels: number, rows: number, size: number, sigma: number): Taps {
  // Lines within 4σ of the pixel contribute (erf beyond 4σ is below 2·10⁻⁸).
  const reach = Math.ceil((4 * sigma + 1) / size) + 1;
  const stride = 2 * reach + 1;
  const index = new Int32Array(pixels * stride);
  const weight = new Float32Array(pixels * stride);
  for (let p = 0; p < pixels; p++) {
    const centre = Math.floor((p + 0.5) / size);
    for (let k = 0; k < stride; k++) {
      const r = centre - reach + k;
      const valid = r >= 0 && r < rows;
      index[p * stride + k] = valid ? r : 0;
      weight[p * stride + k] = valid ? lineCoverage(p, r, size, sigma) : 0;
    }
  }
  return { index, weight, stride };
}

/** Bilinear taps into the glow grid for each output column or row (texel fetches by hand). */
export function glowTaps(pixels: number, samples: number, cellSize: number, m: number): Taps {
  const index = new Int32Array(pixels * 2);
  const weight = new Float32Array(pixels * 2);
  for (let p = 0; p < pixels; p++) {
    const u = Math.min(Math.max(((p + 0.5) / cellSize) * m - 0.5, 0), samples - 1);
    const i0 = Math.floor(u);
    const t = u - i0;
    index[p * 2] = i0;
    index[p * 2 + 1] = Math.min(i0 + 1, samples - 1);
    weight[p * 2] = 1 - t;
    weight[p * 2 + 1] = t;
  }
  return { index, weight, stride: 2 };
}

/** Display-linear thresholds where the 8-bit sRGB code changes: code c for l ≥ T[c] (round half up). */
const THRESHOLDS = Float64Array.from({ length: 257 }, (_, c) => (c === 0 ? -Infinity : c === 256 ? Infinity : srgbDecode((c - 0.5) / 255)));

/** Inverse of the soft knee (formulas.softKnee) for outputs below 1. */
function softKneeInverse(y: number, k: number): number {
  if (y <= k || k >= 1) return y;
  if (y >= 1) return Infinity;
  return k - (1 - k) * Math.log(1 - (y - k) / (1 - k));
}

/**
 * The whole per-channel chain — light, exposure, soft knee, sRGB encode — as thresholds on the
 * relative luminance v: the channel shows code c exactly when v ≥ V[c]. A coarse table finds the
 * code and the thresholds correct it, so the result equals evaluating the formulas, per pixel,
 * without their cost.
 */
export class ChannelCoder {
  private readonly v = new Float64Array(257);
  private readonly table: Uint8Array;
  private readonly steps: number;
  private readonly vMax: number;

  constructor(colour: number, u: OutputUniforms, steps = 16384) {
    const ambient = u.colourY * u.ambientCdM2;
    // display = (colour·(v·peak + off) + ambient)·gain  ⇒  v = ((display/gain − ambient)/colour − off)/peak
    for (let c = 0; c < 257; c++) {
      const display = softKneeInverse(THRESHOLDS[c], u.knee);
      this.v[c] = c === 0 ? -Infinity : colour > 0 ? ((display / u.gain - ambient) / colour - u.offCdM2) / u.peakCdM2 : display <= ambient * u.gain ? -Infinity : Infinity;
    }
    this.steps = steps;
    this.vMax = Math.max(2, ...Array.from(this.v).filter((x) => Number.isFinite(x) && x > 0).slice(-1));
    this.table = Uint8Array.from({ length: steps + 1 }, (_, i) => this.exact((i / steps) * this.vMax));
  }

  /** The code for relative luminance v, by the thresholds alone. */
  private exact(v: number): number {
    let c = 0;
    while (c < 255 && v >= this.v[c + 1]) c++;
    return c;
  }

  code(v: number): number {
    if (v >= this.vMax) return this.exact(v);
    let c = this.table[v > 0 ? ((v / this.vMax) * this.steps) | 0 : 0];
    while (c < 255 && v >= this.v[c + 1]) c++;
    while (c > 0 && v < this.v[c]) c--;
    return c;
  }
}

/** Light across one panel row at output resolution: Σ_cells wx · e (the horizontal half of the separable direct term). */
function rowProfile(emission: Float32Array, row: number, cols: number, xs: Taps, out: Float32Array): void {
  const base = row * cols;
  const { index, weight, stride } = xs;
  for (let x = 0; x < out.length; x++) {
    let s = 0;
    for (let j = 0; j < stride; j++) s += emission[base + index[x * stride + j]] * weight[x * stride + j];
    out[x] = s;
  }
}

/** A band of output rows [y0, y1): one share of a render split across threads. */
export interface RowBand {
  y0: number;
  y1: number;
}

/**
 * Output-resolution stages on the CPU: cell apertures (exact box overlap) or CRT line profiles,
 * plus the bilinearly upsampled glow field, then emission colour, light, soft knee and sRGB
 * encode. Writes an opaque RGBA image of u.width × u.height — or only the rows of `band`: every
 * output row depends on the inputs alone, so bands computed apart give the same bytes as one pass.
 */
export function compose(emission: Float32Array, glow: Field, u: OutputUniforms, out?: RgbaImage, band: RowBand = { y0: 0, y1: u.height }): RgbaImage {
  const { width, height, cols, rows } = u;
  const image = out ?? { width, height, data: new Uint8Array(width * height * 4) };
  const xs = apertureTaps(width, cols, u.cellW, u.fillX);
  const ys = u.crt ? lineTaps(height, rows, u.cellH, u.spotSigmaPx) : apertureTaps(height, rows, u.cellH, u.fillY);
  const gx = glowTaps(width, glow.width, u.cellW, u.glowOversample);
  const gy = glowTaps(height, glow.height, u.cellH, u.glowOversample);
  // Each panel row's horizontal profile is computed once and reused by every output row it touches.
  const profiles = new Map<number, Float32Array>();
  const profileOf = (r: number) => {
    let p = profiles.get(r);
    if (!p) {
      p = new Float32Array(width);
      rowProfile(emission, r, cols, xs, p);
      profiles.set(r, p);
      profiles.delete(r - 2 * ys.stride - 2);
    }
    return p;
  };
  const [red, green, blue] = u.colour.map((c) => new ChannelCoder(c, u));
  const directShare = u.directShare;
  const gIndex = gx.index;
  const gWeight = gx.weight;
  const gData = glow.data;
  const direct = new Float32Array(width);
  const data = image.data;
  for (let y = band.y0; y < band.y1; y++) {
    direct.fill(0);
    for (let k = 0; k < ys.stride; k++) {
      const wy = ys.weight[y * ys.stride + k];
      if (wy === 0) continue;
      const p = profileOf(ys.index[y * ys.stride + k]);
      for (let x = 0; x < width; x++) direct[x] += wy * p[x];
    }
    const g0 = gy.index[y * 2] * glow.width;
    const g1 = gy.index[y * 2 + 1] * glow.width;
    const ty0 = gy.weight[y * 2];
    const ty1 = gy.weight[y * 2 + 1];
    let o = y * width * 4;
    for (let x = 0; x < width; x++) {
      const a = gIndex[x * 2];
      const b = gIndex[x * 2 + 1];
      const tx0 = gWeight[x * 2];
      const tx1 = gWeight[x * 2 + 1];
      const glowValue = (gData[g0 + a] * tx0 + gData[g0 + b] * tx1) * ty0 + (gData[g1 + a] * tx0 + gData[g1 + b] * tx1) * ty1;
      const v = directShare * direct[x] + glowValue;
      data[o] = red.code(v);
      data[o + 1] = green.code(v);
      data[o + 2] = blue.code(v);
      data[o + 3] = 255;
      o += 4;
    }
  }
  return image;
}

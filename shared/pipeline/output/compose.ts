import { srgbDecode } from '../../color/srgb';
import type { Field, RgbaImage } from '../types';
import { apertureCoverage, lineCoverage, softKnee } from './formulas';
import type { OutputUniforms } from './uniforms';

/** Per output column or row: which cells (or lines) touch it and with what coverage. */
interface Taps {
  index: Int32Array;
  weight: Float32Array;
  /** Taps per pixel (fixed stride). */
  stride: number;
}

function apertureTaps(pixels: number, cells: number, size: number, fill: number): Taps {
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

function lineTaps(pixels: number, rows: number, size: number, sigma: number): Taps {
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
function glowTaps(pixels: number, samples: number, cellSize: number, m: number): Taps {
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

/** Linear thresholds where the 8-bit sRGB code changes: code c for l ≥ T[c] (round half up). */
const THRESHOLDS = Float64Array.from({ length: 257 }, (_, c) => (c === 0 ? -Infinity : c === 256 ? Infinity : srgbDecode((c - 0.5) / 255)));
const LUT_SIZE = 4096;
const LUT = Uint8Array.from({ length: LUT_SIZE + 1 }, (_, i) => {
  let c = 0;
  while (c < 255 && i / LUT_SIZE >= THRESHOLDS[c + 1]) c++;
  return c;
});

/** Linear (0–1) → 8-bit sRGB code, exactly as encode8 but by table and threshold correction. */
function toCode(l: number): number {
  if (!(l > 0)) return 0;
  if (l >= 1) return 255;
  let c = LUT[(l * LUT_SIZE) | 0];
  while (c < 255 && l >= THRESHOLDS[c + 1]) c++;
  while (c > 0 && l < THRESHOLDS[c]) c--;
  return c;
}

/**
 * Output-resolution stages on the CPU: cell apertures (exact box overlap) or CRT line profiles,
 * plus the bilinearly upsampled glow field, then emission colour, light, soft knee and sRGB
 * encode. Writes an opaque RGBA image of u.width × u.height.
 */
export function compose(emission: Float32Array, glow: Field, u: OutputUniforms, out?: RgbaImage): RgbaImage {
  const { width, height, cols, rows } = u;
  const image = out ?? { width, height, data: new Uint8ClampedArray(width * height * 4) };
  const xs = apertureTaps(width, cols, u.cellW, u.fillX);
  const ys = u.crt ? lineTaps(height, rows, u.cellH, u.spotSigmaPx) : apertureTaps(height, rows, u.cellH, u.fillY);
  const gx = glowTaps(width, glow.width, u.cellW, u.glowOversample);
  const gy = glowTaps(height, glow.height, u.cellH, u.glowOversample);
  const [cr, cg, cb] = u.colour;
  const ambient = u.colourY * u.ambientCdM2;
  const rowSum = new Float32Array(width);
  const data = image.data;
  for (let y = 0; y < height; y++) {
    // Direct light, separable: Σ_lines wy · Σ_cells wx · e.
    rowSum.fill(0);
    for (let k = 0; k < ys.stride; k++) {
      const wy = ys.weight[y * ys.stride + k];
      if (wy === 0) continue;
      const base = ys.index[y * ys.stride + k] * cols;
      for (let x = 0; x < width; x++) {
        let s = 0;
        for (let j = 0; j < xs.stride; j++) s += emission[base + xs.index[x * xs.stride + j]] * xs.weight[x * xs.stride + j];
        rowSum[x] += wy * s;
      }
    }
    const g0 = gy.index[y * 2] * glow.width;
    const g1 = gy.index[y * 2 + 1] * glow.width;
    const ty0 = gy.weight[y * 2];
    const ty1 = gy.weight[y * 2 + 1];
    let o = y * width * 4;
    for (let x = 0; x < width; x++) {
      const a = gx.index[x * 2];
      const b = gx.index[x * 2 + 1];
      const tx0 = gx.weight[x * 2];
      const tx1 = gx.weight[x * 2 + 1];
      const glowValue = (glow.data[g0 + a] * tx0 + glow.data[g0 + b] * tx1) * ty0 + (glow.data[g1 + a] * tx0 + glow.data[g1 + b] * tx1) * ty1;
      const v = u.directShare * rowSum[x] + glowValue;
      const lum = v * u.peakCdM2 + u.offCdM2;
      data[o] = toCode(softKnee((cr * lum + ambient) * u.gain, u.knee));
      data[o + 1] = toCode(softKnee((cg * lum + ambient) * u.gain, u.knee));
      data[o + 2] = toCode(softKnee((cb * lum + ambient) * u.gain, u.knee));
      data[o + 3] = 255;
      o += 4;
    }
  }
  return image;
}

import { scratchArray } from '../scratch';
import type { RowSource } from '../types';
import { blurKernels } from './blur-kernels';

/**
 * Gaussian blur by a cascade of extended box filters (Gwosdek, Grewenig, Bruhn & Weickert,
 * "Theoretical foundations of Gaussian convolution by extended box filtering", SSVM 2011 —
 * from memory). Each pass is a running sum, so the cost per sample does not depend on σ; the
 * fractional end weight α makes the cascade's variance exactly σ², which plain integer boxes
 * (Wells 1986; Kovesi 2010) miss by up to ~10 % at the small σ a glow often has.
 */
export const BOX_PASSES = 3;

/** Radius r and end weight α of one extended box pass for variance σ²/passes. */
export function extendedBox(sigma: number, passes = BOX_PASSES): { r: number; alpha: number } {
  const v = (sigma * sigma) / passes;
  const r = Math.floor(0.5 * Math.sqrt(12 * v + 1) - 0.5);
  const alpha = ((2 * r + 1) * (r * (r + 1) - 3 * v)) / (6 * (v - (r + 1) * (r + 1)));
  return { r, alpha };
}

/** Variance of one extended box of radius r and end weight α (for tests and docs). */
export function extendedBoxVariance(r: number, alpha: number): number {
  const w = 2 * r + 1 + 2 * alpha;
  let m2 = 0;
  for (let k = -r; k <= r; k++) m2 += k * k;
  m2 += 2 * alpha * (r + 1) * (r + 1);
  return m2 / w;
}

/**
 * One horizontal extended-box pass over a row held in a padded buffer: `from` and `to` have
 * pad = r + 1 zeros on each side of the row's width samples, so the window needs no edge checks
 * (adding those zeros changes no sum: x + 0 and x − 0 are exactly x).
 */
function passRow(from: Float32Array, to: Float32Array, width: number, pad: number, r: number, alpha: number): void {
  const c = 1 / (2 * r + 1 + 2 * alpha);
  let s = 0;
  for (let k = 0; k <= r; k++) s += from[pad + k];
  for (let i = pad; i < pad + width; i++) {
    const lo = from[i - r - 1];
    const hi = from[i + r + 1];
    to[i] = c * (s + alpha * (lo + hi));
    s += hi - from[i - r];
  }
}

/**
 * The horizontal cascade for rows [y0, y1) (by the SIMD kernels of blur.wat where the engine has
 * them; the same bits either way): each row through all passes in two small padded
 * buffers (they stay in the processor's cache), written once to dst. `row(y, into, offset)`
 * supplies row y.
 */
function blurRows(row: RowSource, dst: Float32Array, width: number, y0: number, y1: number, r: number, alpha: number): void {
  const kernels = blurKernels();
  if (kernels) return kernels.across(row, dst, width, y0, y1, r, alpha, BOX_PASSES);
  const pad = r + 1;
  const size = width + 2 * pad;
  // Zero margins: the passes write only the row's own samples.
  const a = scratchArray(0, size).fill(0);
  const b = scratchArray(1, size).fill(0);
  for (let y = y0; y < y1; y++) {
    row(y, a, pad);
    let from = a;
    let to = b;
    for (let p = 0; p < BOX_PASSES; p++) {
      passRow(from, to, width, pad, r, alpha);
      [from, to] = [to, from];
    }
    dst.set(from.subarray(pad, pad + width), y * width);
  }
}

/**
 * One vertical extended-box pass over columns [x0, x1): a running sum per column, walked row by
 * row (cache friendly). Each column is summed on its own, so column bands done apart give the
 * same values as one pass.
 */
function passColumns(
  src: Float32Array,
  dst: Float32Array,
  width: number,
  height: number,
  x0: number,
  x1: number,
  r: number,
  alpha: number,
  sums: Float64Array,
): void {
  const c = 1 / (2 * r + 1 + 2 * alpha);
  const ca = c * alpha;
  sums.fill(0);
  for (let k = 0; k <= r && k < height; k++) {
    const row = k * width;
    for (let x = x0; x < x1; x++) sums[x] += src[row + x];
  }
  for (let y = 0; y < height; y++) {
    const out = y * width;
    const lo = y - r - 1;
    const hi = y + r + 1;
    const hasLo = lo >= 0;
    const hasHi = hi < height;
    const loRow = lo * width;
    const hiRow = hi * width;
    const leave = (y - r) * width;
    if (hasLo && hasHi) {
      // The common case in one sweep: the same sums as the two loops below, each sample read once.
      for (let x = x0; x < x1; x++) {
        const s = sums[x];
        const enter = src[hiRow + x];
        dst[out + x] = c * s + ca * (src[loRow + x] + enter);
        sums[x] = s + (enter - src[leave + x]);
      }
      continue;
    }
    // Near the top or bottom edge: the window reaches past the field.
    if (hasLo) for (let x = x0; x < x1; x++) dst[out + x] = c * sums[x] + ca * src[loRow + x];
    else if (hasHi) for (let x = x0; x < x1; x++) dst[out + x] = c * sums[x] + ca * src[hiRow + x];
    else for (let x = x0; x < x1; x++) dst[out + x] = c * sums[x];
    if (hasHi && y - r >= 0) for (let x = x0; x < x1; x++) sums[x] += src[hiRow + x] - src[leave + x];
    else if (hasHi) for (let x = x0; x < x1; x++) sums[x] += src[hiRow + x];
    else if (y - r >= 0) for (let x = x0; x < x1; x++) sums[x] -= src[leave + x];
  }
}

/**
 * Blurs a width × height field with σx across and σy down (in samples), zero boundary; returns a
 * new array. Energy inside the field is conserved up to what spreads past its edges.
 */
export function gaussianBlur(data: Float32Array, width: number, height: number, sigmaX: number, sigmaY: number): Float32Array {
  return gaussianBlurRows((y, into, offset) => into.set(data.subarray(y * width, (y + 1) * width), offset), width, height, sigmaX, sigmaY);
}

/**
 * gaussianBlur of a field given row by row — `row(y, into, offset)` writes row y at
 * into[offset…] — so a caller can produce rows on the fly instead of building the field. The
 * result goes into `out` when given (width × height samples), else into a new array.
 */
export function gaussianBlurRows(
  row: (y: number, into: Float32Array, offset: number) => void,
  width: number,
  height: number,
  sigmaX: number,
  sigmaY: number,
  out: Float32Array = new Float32Array(width * height),
): Float32Array {
  blurAcross(row, out, width, 0, height, sigmaX);
  blurDown(out, width, height, 0, width, sigmaY);
  return out;
}

/**
 * The first half of gaussianBlurRows for rows [y0, y1) of `out`: σx across (or the rows as they
 * are, for σx = 0). Row bands done apart, then blurDown, give gaussianBlurRows' values.
 */
export function blurAcross(row: RowSource, out: Float32Array, width: number, y0: number, y1: number, sigmaX: number): void {
  if (sigmaX > 0) {
    const { r, alpha } = extendedBox(sigmaX);
    blurRows(row, out, width, y0, y1, r, alpha);
  } else {
    for (let y = y0; y < y1; y++) row(y, out, y * width);
  }
}

/**
 * The second half for columns [x0, x1) of `data`, in place: σy down (by the SIMD kernels where
 * the engine has them). Scratch arrays of this
 * thread carry the passes between, so two threads may each take a column band of one array.
 */
export function blurDown(data: Float32Array, width: number, height: number, x0: number, x1: number, sigmaY: number): void {
  if (!(sigmaY > 0)) return;
  const { r, alpha } = extendedBox(sigmaY);
  const kernels = blurKernels();
  if (kernels) return kernels.down(data, width, height, x0, x1, r, alpha, BOX_PASSES);
  const sums = new Float64Array(width);
  let from: Float32Array = data;
  for (let p = 0; p < BOX_PASSES; p++) {
    const to = p === BOX_PASSES - 1 ? data : scratchArray(2 + (p % 2), data.length);
    passColumns(from, to, width, height, x0, x1, r, alpha, sums);
    from = to;
  }
}

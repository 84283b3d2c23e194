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

/** One horizontal extended-box pass over every row (zero outside), by a running sum. */
function passRows(src: Float32Array, dst: Float32Array, width: number, height: number, r: number, alpha: number): void {
  const c = 1 / (2 * r + 1 + 2 * alpha);
  const at = (base: number, k: number) => (k >= 0 && k < width ? src[base + k] : 0);
  // Interior samples, where the window and both end taps are inside the row, need no checks.
  const first = Math.min(width, r + 1);
  const last = Math.max(first, width - r - 1);
  for (let y = 0; y < height; y++) {
    const base = y * width;
    let s = 0;
    for (let k = 0; k <= r && k < width; k++) s += src[base + k];
    for (let x = 0; x < first; x++) {
      dst[base + x] = c * (s + alpha * (at(base, x - r - 1) + at(base, x + r + 1)));
      s += at(base, x + r + 1) - at(base, x - r);
    }
    for (let x = first; x < last; x++) {
      const lo = src[base + x - r - 1];
      const hi = src[base + x + r + 1];
      dst[base + x] = c * (s + alpha * (lo + hi));
      s += hi - src[base + x - r];
    }
    for (let x = last; x < width; x++) {
      dst[base + x] = c * (s + alpha * (at(base, x - r - 1) + at(base, x + r + 1)));
      s += at(base, x + r + 1) - at(base, x - r);
    }
  }
}

/** One vertical extended-box pass: a running sum per column, walked row by row (cache friendly). */
function passColumns(src: Float32Array, dst: Float32Array, width: number, height: number, r: number, alpha: number, sums: Float64Array): void {
  const c = 1 / (2 * r + 1 + 2 * alpha);
  const ca = c * alpha;
  sums.fill(0);
  for (let k = 0; k <= r && k < height; k++) {
    const row = k * width;
    for (let x = 0; x < width; x++) sums[x] += src[row + x];
  }
  for (let y = 0; y < height; y++) {
    const out = y * width;
    const lo = y - r - 1;
    const hi = y + r + 1;
    const hasLo = lo >= 0;
    const hasHi = hi < height;
    const loRow = lo * width;
    const hiRow = hi * width;
    if (hasLo && hasHi) for (let x = 0; x < width; x++) dst[out + x] = c * sums[x] + ca * (src[loRow + x] + src[hiRow + x]);
    else if (hasLo) for (let x = 0; x < width; x++) dst[out + x] = c * sums[x] + ca * src[loRow + x];
    else if (hasHi) for (let x = 0; x < width; x++) dst[out + x] = c * sums[x] + ca * src[hiRow + x];
    else for (let x = 0; x < width; x++) dst[out + x] = c * sums[x];
    const leave = (y - r) * width;
    if (hasHi && y - r >= 0) for (let x = 0; x < width; x++) sums[x] += src[hiRow + x] - src[leave + x];
    else if (hasHi) for (let x = 0; x < width; x++) sums[x] += src[hiRow + x];
    else if (y - r >= 0) for (let x = 0; x < width; x++) sums[x] -= src[leave + x];
  }
}

/**
 * Blurs a width × height field with σx across and σy down (in samples), zero boundary; returns a
 * new array. Energy inside the field is conserved up to what spreads past its edges.
 */
export function gaussianBlur(data: Float32Array, width: number, height: number, sigmaX: number, sigmaY: number): Float32Array {
  let a = new Float32Array(data.length);
  let b = new Float32Array(data.length);
  let src: Float32Array = data;
  const step = (run: (from: Float32Array, to: Float32Array) => void) => {
    run(src, a);
    src = a;
    [a, b] = [b, a];
  };
  if (sigmaX > 0) {
    const { r, alpha } = extendedBox(sigmaX);
    for (let p = 0; p < BOX_PASSES; p++) step((from, to) => passRows(from, to, width, height, r, alpha));
  }
  if (sigmaY > 0) {
    const { r, alpha } = extendedBox(sigmaY);
    const sums = new Float64Array(width);
    for (let p = 0; p < BOX_PASSES; p++) step((from, to) => passColumns(from, to, width, height, r, alpha, sums));
  }
  return src === data ? Float32Array.from(data) : src;
}

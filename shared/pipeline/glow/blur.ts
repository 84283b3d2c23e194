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

/** One extended-box pass along each line of `src` (lines of `len` samples), zero outside. */
function passLines(src: Float32Array, dst: Float32Array, len: number, lines: number, r: number, alpha: number, prefix: Float64Array): void {
  const c = 1 / (2 * r + 1 + 2 * alpha);
  for (let line = 0; line < lines; line++) {
    const base = line * len;
    prefix[0] = 0;
    for (let k = 0; k < len; k++) prefix[k + 1] = prefix[k] + src[base + k];
    for (let k = 0; k < len; k++) {
      const lo = k - r;
      const hi = k + r + 1;
      let s = prefix[hi < len ? hi : len] - prefix[lo > 0 ? lo : 0];
      if (lo - 1 >= 0) s += alpha * src[base + lo - 1];
      if (hi < len) s += alpha * src[base + hi];
      dst[base + k] = s * c;
    }
  }
}

function transpose(src: Float32Array, dst: Float32Array, width: number, height: number): void {
  for (let y = 0; y < height; y++) for (let x = 0; x < width; x++) dst[x * height + y] = src[y * width + x];
}

/**
 * Blurs a width × height field with σx across and σy down (in samples), zero boundary; returns a
 * new array. Energy inside the field is conserved up to what spreads past its edges.
 */
export function gaussianBlur(data: Float32Array, width: number, height: number, sigmaX: number, sigmaY: number): Float32Array {
  let a = Float32Array.from(data);
  let b = new Float32Array(a.length);
  const prefix = new Float64Array(Math.max(width, height) + 1);
  if (sigmaX > 0) {
    const { r, alpha } = extendedBox(sigmaX);
    for (let p = 0; p < BOX_PASSES; p++) {
      passLines(a, b, width, height, r, alpha, prefix);
      [a, b] = [b, a];
    }
  }
  if (sigmaY > 0) {
    transpose(a, b, width, height);
    [a, b] = [b, a];
    const { r, alpha } = extendedBox(sigmaY);
    for (let p = 0; p < BOX_PASSES; p++) {
      passLines(a, b, height, width, r, alpha, prefix);
      [a, b] = [b, a];
    }
    transpose(a, b, height, width);
    [a, b] = [b, a];
  }
  return a;
}

/**
 * The output stage's formulas, one pure function each; the shader (bench) writes the same ones
 * in GLSL.
 */

/** Overlap length of [a0, a1] and [b0, b1]. */
export function overlap1d(a0: number, a1: number, b0: number, b1: number): number {
  return Math.max(0, Math.min(a1, b1) - Math.max(a0, b0));
}

/** Coverage of output pixel [p, p+1] by the aperture of cell `c` (size s px, fill f), exact. */
export function apertureCoverage(p: number, c: number, s: number, f: number): number {
  const centre = (c + 0.5) * s;
  const half = (f * s) / 2;
  return overlap1d(p, p + 1, centre - half, centre + half);
}

/**
 * erf by Abramowitz & Stegun 7.1.26 (|error| ≤ 1.5·10⁻⁷). The shader does not evaluate it: it reads the
 * coverage taps computed with it on the CPU (src/app/render/panel-renderer.ts).
 */
export function erf(x: number): number {
  const s = x < 0 ? -1 : 1;
  const a = Math.abs(x);
  const t = 1 / (1 + 0.3275911 * a);
  const y = 1 - ((((1.061405429 * t - 1.453152027) * t + 1.421413741) * t - 0.284496736) * t + 0.254829592) * t * Math.exp(-a * a);
  return s * y;
}

/**
 * A CRT line's light falling on output row [p, p+1]: the line (centre of row `r`, pitch s px)
 * has a Gaussian profile of σ px whose integral is one line pitch, so a flat field of lines
 * averages to a fully lit aperture. Area-true: the profile integrated over the row. Centred:
 * the line's centre is moved onto the centre of the pixel row it falls in (by at most half a
 * pixel) and the profile is sampled at row centres, normalised so the line keeps exactly its
 * light — at 2–3 px a line each line then shows as a bright row between darker ones, where area
 * sampling of a centre on a pixel boundary shows a flat field.
 */
export function lineCoverage(p: number, r: number, s: number, sigma: number, centred = false): number {
  if (!centred) {
    const centre = (r + 0.5) * s;
    const k = 1 / (Math.SQRT2 * sigma);
    return (s / 2) * (erf((p + 1 - centre) * k) - erf((p - centre) * k));
  }
  const d = p + 0.5 - lineCentre(r, s, true);
  const reach = centredReach(sigma);
  if (Math.abs(d) > reach) return 0;
  let z = 0;
  for (let j = -reach; j <= reach; j++) z += Math.exp(-(j * j) / (2 * sigma * sigma));
  return (s * Math.exp(-(d * d) / (2 * sigma * sigma))) / z;
}

/** Rows either side of its own that a centred line lights: within 4σ + 1 px (the taps' reach). */
function centredReach(sigma: number): number {
  return Math.floor(4 * sigma + 1);
}

/** Where line r's centre sits, in output pixels: (r + ½)·s, or the centre of the pixel row holding it. */
export function lineCentre(r: number, s: number, centred: boolean): number {
  const c = (r + 0.5) * s;
  return centred ? Math.floor(c) + 0.5 : c;
}

/** Soft knee: identity up to k, then k + (1−k)(1 − e^(−(x−k)/(1−k))), approaching 1 smoothly (C¹). */
export function softKnee(x: number, k: number): number {
  if (x <= k || k >= 1) return Math.min(x, 1);
  const span = 1 - k;
  return k + span * (1 - Math.exp(-(x - k) / span));
}

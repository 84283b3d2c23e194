import { CIE_END_NM, CIE_START_NM, CIE_X, CIE_Y, CIE_Z } from './cie1931';
import { encode8, hexOf, xyzToLinearSrgb } from './srgb';

/** One emission band: a Gaussian of this peak and full width at half maximum (0 = a line). */
export interface EmissionBand {
  peakNm: number;
  fwhmNm: number;
  /** Relative radiant power of the band (its integral), any positive scale. */
  weight: number;
}

/** FWHM = 2·√(2 ln 2)·σ ≈ 2.35482·σ for a Gaussian. */
export const FWHM_PER_SIGMA = 2 * Math.sqrt(2 * Math.LN2);

/** The colour-matching functions at λ, linearly interpolated in the 1-nm table (0 outside it). */
export function cmfAt(nm: number): [number, number, number] {
  if (nm < CIE_START_NM || nm > CIE_END_NM) return [0, 0, 0];
  const f = nm - CIE_START_NM;
  const i = Math.min(Math.floor(f), CIE_END_NM - CIE_START_NM - 1);
  const t = f - i;
  const lerp = (a: Float64Array) => a[i] * (1 - t) + a[i + 1] * t;
  return [lerp(CIE_X), lerp(CIE_Y), lerp(CIE_Z)];
}

/**
 * Tristimulus XYZ of a sum of bands, integrated at 1 nm over 380–780 nm (lines are sampled at
 * their wavelength). Scaled so that Y = 1.
 */
export function spectrumToXyz(bands: readonly EmissionBand[]): [number, number, number] {
  let X = 0;
  let Y = 0;
  let Z = 0;
  for (const band of bands) {
    if (band.fwhmNm <= 0) {
      const [x, y, z] = cmfAt(band.peakNm);
      X += band.weight * x;
      Y += band.weight * y;
      Z += band.weight * z;
      continue;
    }
    const sigma = band.fwhmNm / FWHM_PER_SIGMA;
    // Normalise the band's samples to unit area so `weight` is its radiant power.
    let area = 0;
    let bx = 0;
    let by = 0;
    let bz = 0;
    for (let nm = CIE_START_NM; nm <= CIE_END_NM; nm++) {
      const s = Math.exp(-((nm - band.peakNm) ** 2) / (2 * sigma * sigma));
      const k = nm - CIE_START_NM;
      area += s;
      bx += s * CIE_X[k];
      by += s * CIE_Y[k];
      bz += s * CIE_Z[k];
    }
    if (area === 0) continue;
    X += (band.weight * bx) / area;
    Y += (band.weight * by) / area;
    Z += (band.weight * bz) / area;
  }
  if (Y <= 0) throw new RangeError('the emission has no visible light (Y = 0): put a band between 380 and 780 nm');
  return [X / Y, 1, Z / Y];
}

/** Chromaticity x, y → XYZ with Y = 1. */
export function chromaticityToXyz(x: number, y: number): [number, number, number] {
  if (!(y > 0)) throw new RangeError(`chromaticity y must be above 0, got ${y}`);
  return [x / y, 1, (1 - x - y) / y];
}

/**
 * Gamut rule for light outside sRGB: add D65 neutral (equal linear R = G = B, since D65 is the
 * sRGB white) until the smallest channel is 0, then divide by the largest, so the result is
 * the brightest displayable colour of nearly the same hue with its largest channel at 1.
 */
export function gamutMap(rgb: readonly [number, number, number]): [number, number, number] {
  const lift = Math.max(0, -Math.min(rgb[0], rgb[1], rgb[2]));
  const lifted = rgb.map((c) => c + lift) as [number, number, number];
  const peak = Math.max(...lifted);
  return lifted.map((c) => c / peak) as [number, number, number];
}

/** What an emission looks like: chromaticity, the display colour (largest channel 1) and its hex. */
export interface EmissionColour {
  x: number;
  y: number;
  /** Linear sRGB after the gamut rule, largest channel = 1. */
  rgb: [number, number, number];
  hex: string;
}

export function emissionColour(xyz: readonly [number, number, number]): EmissionColour {
  const sum = xyz[0] + xyz[1] + xyz[2];
  const rgb = gamutMap(xyzToLinearSrgb(xyz));
  return { x: xyz[0] / sum, y: xyz[1] / sum, rgb, hex: hexOf(rgb.map(encode8)) };
}

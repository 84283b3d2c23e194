// sRGB, IEC 61966-2-1: transfer functions and the XYZ → linear sRGB matrix (D65 white).

/** Decodes an sRGB-encoded value (0–1) to linear light (IEC 61966-2-1, threshold 0.04045). */
export function srgbDecode(v: number): number {
  return v <= 0.04045 ? v / 12.92 : ((v + 0.055) / 1.055) ** 2.4;
}

/** Encodes linear light (0–1) to an sRGB value (IEC 61966-2-1, threshold 0.0031308). */
export function srgbEncode(l: number): number {
  return l <= 0.0031308 ? 12.92 * l : 1.055 * l ** (1 / 2.4) - 0.055;
}

/** Linear → 8-bit sRGB code value: clamped, rounded half up. */
export function encode8(l: number): number {
  const v = srgbEncode(Math.min(1, Math.max(0, l)));
  return Math.floor(v * 255 + 0.5);
}

/** 256-entry table: 8-bit sRGB code value → linear light. */
export const SRGB_TO_LINEAR = Float32Array.from({ length: 256 }, (_, i) => srgbDecode(i / 255));

/** XYZ → linear sRGB (IEC 61966-2-1, rows R, G, B). */
export const XYZ_TO_SRGB = [
  [3.2406, -1.5372, -0.4986],
  [-0.9689, 1.8758, 0.0415],
  [0.0557, -0.204, 1.057],
] as const;

/** Linear sRGB → XYZ (IEC 61966-2-1, rows X, Y, Z; D65 white). */
export const SRGB_TO_XYZ = [
  [0.4124, 0.3576, 0.1805],
  [0.2126, 0.7152, 0.0722],
  [0.0193, 0.1192, 0.9505],
] as const;

/** CIE 1931 chromaticity x, y of a linear sRGB colour (through SRGB_TO_XYZ). */
export function linearSrgbToChromaticity([r, g, b]: readonly [number, number, number]): [number, number] {
  const [X, Y, Z] = SRGB_TO_XYZ.map((row) => row[0] * r + row[1] * g + row[2] * b);
  const sum = X + Y + Z;
  return [X / sum, Y / sum];
}

/** Multiplies an XYZ triple by XYZ_TO_SRGB. */
export function xyzToLinearSrgb([x, y, z]: readonly [number, number, number]): [number, number, number] {
  const m = XYZ_TO_SRGB;
  return [m[0][0] * x + m[0][1] * y + m[0][2] * z, m[1][0] * x + m[1][1] * y + m[1][2] * z, m[2][0] * x + m[2][1] * y + m[2][2] * z];
}

/** Luma weights: Rec. 709 (relative luminance of linear sRGB) and Rec. 601 (on encoded values). */
export const REC709 = [0.2126, 0.7152, 0.0722] as const;
export const REC601 = [0.299, 0.587, 0.114] as const;

/** Two hex digits per channel, upper case, from 8-bit codes. */
export function hexOf(codes: readonly number[]): string {
  return `#${codes.map((c) => c.toString(16).padStart(2, '0')).join('')}`.toUpperCase();
}

/** Table resolution of the fast transfer functions (error below 10⁻⁵, a 400th of an 8-bit step, with linear interpolation). */
const FAST_STEPS = 16384;
const ENCODE_TABLE = Float64Array.from({ length: FAST_STEPS + 2 }, (_, i) => srgbEncode(Math.min(1, i / FAST_STEPS)));
const DECODE_TABLE = Float64Array.from({ length: FAST_STEPS + 2 }, (_, i) => srgbDecode(Math.min(1, i / FAST_STEPS)));

function lookup(table: Float64Array, v: number): number {
  if (!(v > 0)) return 0;
  if (v >= 1) return 1;
  const f = v * FAST_STEPS;
  const i = f | 0;
  const t = f - i;
  return table[i] + (table[i + 1] - table[i]) * t;
}

/** srgbEncode for 0–1 by table and linear interpolation (|error| < 10⁻⁵): for per-cell hot loops. */
export const srgbEncodeFast = (l: number): number => lookup(ENCODE_TABLE, l);
/** srgbDecode for 0–1 by table and linear interpolation (|error| < 10⁻⁵): for per-cell hot loops. */
export const srgbDecodeFast = (v: number): number => lookup(DECODE_TABLE, v);

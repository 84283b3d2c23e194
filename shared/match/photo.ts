import type { mat3 } from 'gl-matrix';
import { REC709, srgbDecode } from '../color/srgb';
import type { RgbaImage } from '../pipeline/types';
import { applyHomography } from './homography';
import type { CellRect } from './pattern';

/** How the camera encoded light: the sRGB curve (what cameras write into JPEGs) or a plain power law. */
export type CameraCurve = { kind: 'srgb' } | { kind: 'gamma'; gamma: number };

/** A photo in linear light: channel planes and relative luminance, plus where a channel reached the top code. */
export interface LinearPhoto {
  width: number;
  height: number;
  r: Float32Array;
  g: Float32Array;
  b: Float32Array;
  /** Relative luminance (Rec. 709 weights on linear sRGB). */
  y: Float32Array;
  /** 1 where any channel is at 254 or 255 (clipped light). */
  clipped: Uint8Array;
}

/** Code value at or above which a channel counts as clipped. */
export const CLIP_CODE = 254;

/** Decodes an 8-bit photo to linear light with the stated camera curve. */
export function linearise(photo: RgbaImage, curve: CameraCurve): LinearPhoto {
  const table = Float32Array.from({ length: 256 }, (_, i) => (curve.kind === 'srgb' ? srgbDecode(i / 255) : (i / 255) ** curve.gamma));
  const n = photo.width * photo.height;
  const out: LinearPhoto = {
    width: photo.width,
    height: photo.height,
    r: new Float32Array(n),
    g: new Float32Array(n),
    b: new Float32Array(n),
    y: new Float32Array(n),
    clipped: new Uint8Array(n),
  };
  const d = photo.data;
  for (let i = 0; i < n; i++) {
    const R = d[i * 4];
    const G = d[i * 4 + 1];
    const B = d[i * 4 + 2];
    out.r[i] = table[R];
    out.g[i] = table[G];
    out.b[i] = table[B];
    out.y[i] = REC709[0] * table[R] + REC709[1] * table[G] + REC709[2] * table[B];
    out.clipped[i] = R >= CLIP_CODE || G >= CLIP_CODE || B >= CLIP_CODE ? 1 : 0;
  }
  return out;
}

/** Bilinear sample of a plane at pixel coordinates (pixel i spans [i, i + 1)); 0 outside. */
export function bilinear(plane: ArrayLike<number>, width: number, height: number, x: number, y: number): number {
  const u = x - 0.5;
  const v = y - 0.5;
  const x0 = Math.floor(u);
  const y0 = Math.floor(v);
  const tx = u - x0;
  const ty = v - y0;
  const at = (i: number, j: number) => (i < 0 || j < 0 || i >= width || j >= height ? 0 : plane[j * width + i]);
  return (at(x0, y0) * (1 - tx) + at(x0 + 1, y0) * tx) * (1 - ty) + (at(x0, y0 + 1) * (1 - tx) + at(x0 + 1, y0 + 1) * tx) * ty;
}

/** A rectified region: samples of a photo plane on the panel's own grid. */
export interface Rectified {
  width: number;
  height: number;
  data: Float32Array;
}

/**
 * Resamples a photo plane onto the panel's grid: `rect` (cells) at sx × sy samples a cell, each
 * sample the mean of kx × ky bilinear taps spread over its footprint (from the photo pixels a
 * sample spans each way, at most 4, or `taps` both ways), so a photo denser than the samples is averaged rather than
 * aliased. `toPhoto` maps cell coordinates to photo pixels; `shift` moves the grid (in cells).
 */
export function rectify(
  plane: ArrayLike<number>,
  photo: Pick<LinearPhoto, 'width' | 'height'>,
  toPhoto: mat3,
  rect: CellRect,
  sx: number,
  sy: number,
  options: { shift?: [number, number]; taps?: number } = {},
): Rectified {
  const { width, height } = rectifiedSize(rect, sx, sy);
  return { width, height, data: rectifyPlanes([plane], photo, toPhoto, rect, sx, sy, options)[0] };
}

/** The size of rectify's result. */
export function rectifiedSize(rect: CellRect, sx: number, sy: number): { width: number; height: number } {
  return { width: Math.round(rect.w * sx), height: Math.round(rect.h * sy) };
}

/**
 * rectify for several planes of one photo at once, each tap's position in the photo worked out
 * once for all of them, and only the result's rows [row0, row1) (all by default): one array a
 * plane, row row0 first. Each value is rectify's, bit for bit (bilinear's arithmetic, inline).
 */
export function rectifyPlanes(
  planes: readonly ArrayLike<number>[],
  photo: Pick<LinearPhoto, 'width' | 'height'>,
  toPhoto: mat3,
  rect: CellRect,
  sx: number,
  sy: number,
  options: { shift?: [number, number]; taps?: number; rows?: [number, number] } = {},
): Float32Array[] {
  const { width, height } = rectifiedSize(rect, sx, sy);
  const [row0, row1] = options.rows ?? [0, height];
  const out = planes.map(() => new Float32Array(width * (row1 - row0)));
  const [dx, dy] = options.shift ?? [0, 0];
  const ppc = pixelsPerCell(toPhoto, rect.x + rect.w / 2, rect.y + rect.h / 2);
  // Taps across and down: enough to cover each sample's footprint in the photo (at most 4 each way).
  const kx = options.taps ?? Math.min(4, Math.max(1, Math.ceil(ppc.across / sx)));
  const ky = options.taps ?? Math.min(4, Math.max(1, Math.ceil(ppc.down / sy)));
  // The homography's entries (column-major), applied inline: this loop runs millions of times.
  const m = toPhoto;
  const pw = photo.width;
  const ph = photo.height;
  const n = planes.length;
  const sums = new Float64Array(n);
  for (let j = row0; j < row1; j++) {
    for (let i = 0; i < width; i++) {
      sums.fill(0);
      for (let b = 0; b < ky; b++) {
        const cy = rect.y + dy + (j + (b + 0.5) / ky) / sy;
        for (let a = 0; a < kx; a++) {
          const cx = rect.x + dx + (i + (a + 0.5) / kx) / sx;
          const w = m[2] * cx + m[5] * cy + m[8];
          // bilinear(plane, pw, ph, x, y) for each plane, its corners found once.
          const u = (m[0] * cx + m[3] * cy + m[6]) / w - 0.5;
          const v = (m[1] * cx + m[4] * cy + m[7]) / w - 0.5;
          const x0 = Math.floor(u);
          const y0 = Math.floor(v);
          const tx = u - x0;
          const ty = v - y0;
          const left = x0 >= 0 && x0 < pw;
          const right = x0 + 1 >= 0 && x0 + 1 < pw;
          const top = y0 >= 0 && y0 < ph;
          const bottom = y0 + 1 >= 0 && y0 + 1 < ph;
          const o = y0 * pw + x0;
          for (let k = 0; k < n; k++) {
            const p = planes[k];
            const a00 = left && top ? p[o] : 0;
            const a10 = right && top ? p[o + 1] : 0;
            const a01 = left && bottom ? p[o + pw] : 0;
            const a11 = right && bottom ? p[o + pw + 1] : 0;
            sums[k] += (a00 * (1 - tx) + a10 * tx) * (1 - ty) + (a01 * (1 - tx) + a11 * tx) * ty;
          }
        }
      }
      for (let k = 0; k < n; k++) out[k][(j - row0) * width + i] = sums[k] / (kx * ky);
    }
  }
  return out;
}

/** Photo pixels per cell across and down at a cell position (how finely the photo resolves the cells there). */
export function pixelsPerCell(toPhoto: mat3, x: number, y: number): { across: number; down: number } {
  const o = applyHomography(toPhoto, x, y);
  const a = applyHomography(toPhoto, x + 1, y);
  const d = applyHomography(toPhoto, x, y + 1);
  return { across: Math.hypot(a[0] - o[0], a[1] - o[1]), down: Math.hypot(d[0] - o[0], d[1] - o[1]) };
}

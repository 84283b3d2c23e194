import { SRGB_TO_LINEAR } from '../../color/srgb';
import type { PanelParams } from '../../model/parameters';
import type { RgbaImage } from '../types';

/** Linear-light RGB per panel cell (3 floats a cell), transparent pixels composited on black. */
export interface CellRgb {
  cols: number;
  rows: number;
  data: Float32Array;
}

/** How artwork pixels land on the grid: scale (cells per pixel, x and y) and offset (cells). */
export interface Placement {
  scaleX: number;
  scaleY: number;
  offsetX: number;
  offsetY: number;
}

/**
 * Where the artwork goes. native: one pixel per cell, centred (crop or pad). integer: the
 * largest whole-number enlargement that fits, or the smallest whole-number reduction
 * (1/k). area: the largest scale that fits, keeping the artwork's physical aspect on cells of
 * pitch pitchX × pitchY. Native and integer placements start on a whole cell (the floor of the
 * centring offset): pixel art maps pixel → cell exactly, and with an odd number of spare cells
 * the extra one is on the right or at the bottom.
 */
export function placement(width: number, height: number, cell: PanelParams['cell'], fit: PanelParams['source']['fit']): Placement {
  const { cols, rows } = cell;
  let sx = 1;
  let sy = 1;
  if (fit === 'integer') {
    const up = Math.floor(Math.min(cols / width, rows / height));
    const s = up >= 1 ? up : 1 / Math.ceil(Math.max(width / cols, height / rows));
    sx = sy = s;
  } else if (fit === 'area') {
    // A pixel is square on the artwork; keep that on cells of aspect pitchX : pitchY.
    const aspect = cell.pitchXMm / cell.pitchYMm;
    const s = Math.min(cols / width, rows / (height * aspect));
    sx = s;
    sy = s * aspect;
  }
  const offsetX = (cols - width * sx) / 2;
  const offsetY = (rows - height * sy) / 2;
  if (fit === 'area') return { scaleX: sx, scaleY: sy, offsetX, offsetY };
  return { scaleX: sx, scaleY: sy, offsetX: Math.floor(offsetX), offsetY: Math.floor(offsetY) };
}

/** Overlap length of [a0, a1] and [b0, b1]. */
const overlap = (a0: number, a1: number, b0: number, b1: number) => Math.max(0, Math.min(a1, b1) - Math.max(a0, b0));

/** Grid rows [r0, r1). */
export interface GridRows {
  r0: number;
  r1: number;
}

/**
 * Resamples the artwork onto the grid by exact area averaging in linear light: each cell's value
 * is the mean of the pixels under it, weighted by their overlap (so a 1:1 placement copies and an
 * integer enlargement repeats pixels exactly). Areas outside the artwork are black. Only the grid
 * rows in `band` are written (all by default; each row depends on the artwork alone, so bands
 * may be fitted apart, on different threads).
 */
export function fitToGrid(
  image: RgbaImage,
  cell: PanelParams['cell'],
  fit: PanelParams['source']['fit'],
  out?: CellRgb,
  band: GridRows = { r0: 0, r1: cell.rows },
): CellRgb {
  const { cols, rows } = cell;
  const result = out ?? { cols, rows, data: new Float32Array(cols * rows * 3) };
  result.data.fill(0, band.r0 * cols * 3, band.r1 * cols * 3);
  const p = placement(image.width, image.height, cell, fit);
  if (isOneToOne(p)) return copyOneToOne(image, p, result, band);
  // Per axis: for each cell, the pixel span and weights it covers (separable box overlap).
  const spans = (n: number, scale: number, offset: number, size: number) =>
    Array.from({ length: n }, (_, c) => {
      const x0 = (c - offset) / scale;
      const x1 = (c + 1 - offset) / scale;
      const first = Math.max(0, Math.floor(x0));
      const last = Math.min(size - 1, Math.ceil(x1) - 1);
      const idx: number[] = [];
      const w: number[] = [];
      for (let px = first; px <= last; px++) {
        const o = overlap(x0, x1, px, px + 1) * scale;
        if (o > 1e-9) {
          idx.push(px);
          w.push(o);
        }
      }
      return { idx, w };
    });
  const xs = spans(cols, p.scaleX, p.offsetX, image.width);
  const ys = spans(rows, p.scaleY, p.offsetY, image.height);
  const src = image.data;
  const dst = result.data;
  // A local, not the module's import: no property load per pixel once compiled to CommonJS.
  const decode = SRGB_TO_LINEAR;
  for (let r = band.r0; r < band.r1; r++) {
    const sy = ys[r];
    if (!sy.idx.length) continue;
    for (let c = 0; c < cols; c++) {
      const sx = xs[c];
      if (!sx.idx.length) continue;
      let R = 0;
      let G = 0;
      let B = 0;
      for (let j = 0; j < sy.idx.length; j++) {
        const row = sy.idx[j] * image.width;
        const wy = sy.w[j];
        for (let k = 0; k < sx.idx.length; k++) {
          const o = (row + sx.idx[k]) * 4;
          const w = wy * sx.w[k] * (src[o + 3] / 255);
          R += w * decode[src[o]];
          G += w * decode[src[o + 1]];
          B += w * decode[src[o + 2]];
        }
      }
      const d = (r * cols + c) * 3;
      dst[d] = R;
      dst[d + 1] = G;
      dst[d + 2] = B;
    }
  }
  return result;
}

/** Whether a placement maps each pixel onto one whole cell (scale 1, whole-cell offset): fitToGrid then copies. */
export const isOneToOne = (p: Placement): boolean =>
  p.scaleX === 1 && p.scaleY === 1 && Number.isInteger(p.offsetX) && Number.isInteger(p.offsetY);

/**
 * The pixels [x0, x1) × [y0, y1) of a one-to-one placement that land on the grid rows in `band`
 * (within the grid) of a grid `cols` wide: pixel (x, y) lands on cell (x + offsetX, y + offsetY).
 */
export function oneToOneSpan(
  image: { width: number; height: number },
  p: Placement,
  cols: number,
  band: GridRows,
): { x0: number; x1: number; y0: number; y1: number } {
  return {
    x0: Math.max(0, -p.offsetX),
    y0: Math.max(0, -p.offsetY, band.r0 - p.offsetY),
    x1: Math.min(image.width, cols - p.offsetX),
    y1: Math.min(image.height, band.r1 - p.offsetY),
  };
}

/** The 1:1 case of fitToGrid (whole-cell offset): a straight copy through the decode table, for the grid rows in `band`. */
function copyOneToOne(image: RgbaImage, p: Placement, out: CellRgb, band: GridRows): CellRgb {
  const { x0, x1, y0, y1 } = oneToOneSpan(image, p, out.cols, band);
  // Locals for the hot loop: typed arrays and numbers only, no property loads per pixel.
  const src = image.data;
  const dst = out.data;
  const decode = SRGB_TO_LINEAR;
  const width = image.width;
  const cols = out.cols;
  const ox = p.offsetX;
  const oy = p.offsetY;
  for (let y = y0; y < y1; y++) {
    let o = (y * width + x0) * 4;
    let d = ((y + oy) * cols + x0 + ox) * 3;
    for (let x = x0; x < x1; x++, o += 4, d += 3) {
      const alpha = src[o + 3];
      if (alpha === 255) {
        dst[d] = decode[src[o]];
        dst[d + 1] = decode[src[o + 1]];
        dst[d + 2] = decode[src[o + 2]];
      } else {
        const a = alpha / 255;
        dst[d] = a * decode[src[o]];
        dst[d + 1] = a * decode[src[o + 1]];
        dst[d + 2] = a * decode[src[o + 2]];
      }
    }
  }
  return out;
}

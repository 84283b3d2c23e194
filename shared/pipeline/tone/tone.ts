import { REC601, REC709, srgbDecodeFast as srgbDecode, srgbEncodeFast as srgbEncode } from '../../color/srgb';
import type { PanelParams } from '../../model/parameters';
import { fitToGrid, oneToOneSpan, type CellRgb, type GridRows, type Placement } from '../fit/fit';
import type { RgbaImage } from '../types';

/** Slots of tone's memos of colours it has toned, per thread: direct-mapped caches. */
const MEMO_SLOTS = 1 << 12;
/** A slot's place in a memo: the top 12 bits of a multiplicative hash of its key words. */
const slotOf = (a: number, b: number, c: number) => Math.imul(Math.imul(Math.imul(a, 0x9e3779b1) + b, 0x85ebca77) + c, 0xc2b2ae3d) >>> 20;
/** Keyed by a cell's three float32s (3 words a slot), and by a pixel's RGBA word. */
const rgbKeys = new Uint32Array(MEMO_SLOTS * 3);
const rgbValues = new Float32Array(MEMO_SLOTS);
const pixelKeys = new Uint32Array(MEMO_SLOTS);
const pixelValues = new Float32Array(MEMO_SLOTS);
/** Cells (or, one-to-one, rows reaching past them) after which a memo is dropped for the rest of a call if most missed it (a photograph, not pixel art). */
const MEMO_TRIAL = 8192;

/**
 * The tone curve for these settings: a cell's linear RGB → its drive demand in linear light (0–1).
 * Luma by Rec. 709 on linear light (or Rec. 601 on the encoded values), then in the perceptual
 * (sRGB-encoded) domain: contrast about 0.5, brightness offset, gamma exponent, invert, black
 * clip; finally decoded back to linear light, where levels and dithering work (so dithering
 * keeps mean luminance).
 */
export function toneCurve(source: PanelParams['source']): (R: number, G: number, B: number) => number {
  const { brightness, contrast, gamma, invert, threshold } = source;
  const rec601 = source.luma === 'rec601';
  // Locals: no property loads per cell (an imported function is a property of the module
  // object once compiled to CommonJS).
  const encode = srgbEncode;
  const decode = srgbDecode;
  const [r601, g601, b601] = REC601;
  const [r709, g709, b709] = REC709;
  return (R, G, B) => {
    let p = rec601 ? r601 * encode(R) + g601 * encode(G) + b601 * encode(B) : encode(r709 * R + g709 * G + b709 * B);
    p = (p - 0.5) * contrast + 0.5 + brightness;
    p = Math.min(1, Math.max(0, p));
    if (gamma !== 1) p = p ** gamma;
    if (invert) p = 1 - p;
    p = p <= threshold ? 0 : (p - threshold) / (1 - threshold);
    return decode(p);
  };
}

/**
 * Tone: linear RGB per cell → drive demand (toneCurve), into `out` if given.
 *
 * Artwork repeats a few colours over many cells, so a cell whose colour (its three float32s, bit
 * for bit) is in the memo takes the demand computed for it there: the same number, without the
 * two transfer-function lookups and the tone curve.
 */
export function tone(rgb: CellRgb, source: PanelParams['source'], out?: Float32Array): Float32Array {
  const n = rgb.cols * rgb.rows;
  const result = out ?? new Float32Array(n);
  const demand = toneCurve(source);
  const data = rgb.data;
  const bits = new Uint32Array(data.buffer, data.byteOffset, n * 3);
  // Every slot starts as black (all key bits 0), whose demand is computed here.
  const keys = rgbKeys;
  const values = rgbValues;
  keys.fill(0);
  values.fill(demand(0, 0, 0));
  let misses = 0;
  let i = 0;
  for (; i < n; i++) {
    if (i === MEMO_TRIAL && misses > MEMO_TRIAL / 2) break;
    const a = bits[i * 3];
    const b = bits[i * 3 + 1];
    const c = bits[i * 3 + 2];
    const slot = slotOf(a, b, c);
    const k = slot * 3;
    if (keys[k] === a && keys[k + 1] === b && keys[k + 2] === c) {
      result[i] = values[slot];
      continue;
    }
    misses++;
    keys[k] = a;
    keys[k + 1] = b;
    keys[k + 2] = c;
    result[i] = values[slot] = demand(data[i * 3], data[i * 3 + 1], data[i * 3 + 2]);
  }
  for (; i < n; i++) result[i] = demand(data[i * 3], data[i * 3 + 1], data[i * 3 + 2]);
  return result;
}

/**
 * tone of fitToGrid for a one-to-one placement `place` (fit.ts isOneToOne) of `image` on the grid
 * of `p`, for the grid rows in `band`, into `out` (a whole grid): each cell's demand straight from
 * its pixel's RGBA word, through a memo keyed by that word, without a grid of linear colours in
 * between. A pixel the memo misses is toned from its row fitted into `fitted` (a whole grid of
 * the fit's own numbers), so the demand is the same number; cells outside the artwork are black.
 * Null, with `out` part written, when most of the first rows' pixels missed the memo (a
 * photograph: fit and tone are then quicker).
 */
export function toneOneToOne(
  image: RgbaImage,
  p: Pick<PanelParams, 'cell' | 'source'>,
  place: Placement,
  band: GridRows,
  out: Float32Array,
  fitted: CellRgb,
): Float32Array | null {
  const cols = p.cell.cols;
  const demand = toneCurve(p.source);
  const black = demand(0, 0, 0);
  out.fill(black, band.r0 * cols, band.r1 * cols);
  const { x0, x1, y0, y1 } = oneToOneSpan(image, place, cols, band);
  const src = image.data;
  const width = image.width;
  const linear = fitted.data;
  // RGBA words where the bytes line up; else each pixel's four bytes put together.
  const words = src.byteOffset % 4 === 0 ? new Uint32Array(src.buffer, src.byteOffset, src.length >> 2) : null;
  // Every slot starts as transparent black (word 0), whose demand is black's.
  const keys = pixelKeys;
  const values = pixelValues;
  keys.fill(0);
  values.fill(black);
  let seen = 0;
  let misses = 0;
  let fittedRow = -1;
  for (let y = y0; y < y1; y++) {
    if (seen >= MEMO_TRIAL && misses > MEMO_TRIAL / 2) return null;
    const row = y + place.offsetY;
    let d = row * cols + x0 + place.offsetX;
    for (let x = x0, o = (y * width + x0) * 4; x < x1; x++, o += 4, d++) {
      const key = words ? words[o >> 2] : (src[o] | (src[o + 1] << 8) | (src[o + 2] << 16) | (src[o + 3] << 24)) >>> 0;
      const slot = slotOf(key, 0, 0);
      if (keys[slot] === key) {
        out[d] = values[slot];
        continue;
      }
      misses++;
      if (fittedRow !== row) {
        fitToGrid(image, p.cell, p.source.fit, fitted, { r0: row, r1: row + 1 });
        fittedRow = row;
      }
      keys[slot] = key;
      out[d] = values[slot] = demand(linear[d * 3], linear[d * 3 + 1], linear[d * 3 + 2]);
    }
    seen += x1 - x0;
  }
  return out;
}

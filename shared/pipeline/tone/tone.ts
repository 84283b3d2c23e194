import { REC601, REC709, srgbDecodeFast as srgbDecode, srgbEncodeFast as srgbEncode } from '../../color/srgb';
import type { PanelParams } from '../../model/parameters';
import type { CellRgb } from '../fit/fit';

/** Slots of tone's memo of colours it has toned, per thread: a direct-mapped cache, 3 keys a slot. */
const MEMO_SLOTS = 1 << 12;
const memoKeys = new Uint32Array(MEMO_SLOTS * 3);
const memoValues = new Float32Array(MEMO_SLOTS);
/** Cells after which the memo is dropped for the rest of a call if most of them missed it (a photograph, not pixel art). */
const MEMO_TRIAL = 8192;

/**
 * Tone: linear RGB per cell → drive demand in linear light (0–1). Luma by Rec. 709 on linear
 * light (or Rec. 601 on the encoded values), then in the perceptual (sRGB-encoded) domain:
 * contrast about 0.5, brightness offset, gamma exponent, invert, black clip; finally decoded
 * back to linear light, where levels and dithering work (so dithering keeps mean luminance).
 *
 * Artwork repeats a few colours over many cells, so a cell whose colour (its three float32s, bit
 * for bit) is in the memo takes the demand computed for it there: the same number, without the
 * two transfer-function lookups and the tone curve.
 */
export function tone(rgb: CellRgb, source: PanelParams['source'], out?: Float32Array): Float32Array {
  const n = rgb.cols * rgb.rows;
  const result = out ?? new Float32Array(n);
  const { brightness, contrast, gamma, invert, threshold } = source;
  const rec601 = source.luma === 'rec601';
  // Locals for the hot loop: no property loads per cell (an imported function is a property of
  // the module object once compiled to CommonJS).
  const encode = srgbEncode;
  const decode = srgbDecode;
  const data = rgb.data;
  const bits = new Uint32Array(data.buffer, data.byteOffset, n * 3);
  const [r601, g601, b601] = REC601;
  const [r709, g709, b709] = REC709;
  const demand = (R: number, G: number, B: number): number => {
    let p = rec601 ? r601 * encode(R) + g601 * encode(G) + b601 * encode(B) : encode(r709 * R + g709 * G + b709 * B);
    p = (p - 0.5) * contrast + 0.5 + brightness;
    p = Math.min(1, Math.max(0, p));
    if (gamma !== 1) p = p ** gamma;
    if (invert) p = 1 - p;
    p = p <= threshold ? 0 : (p - threshold) / (1 - threshold);
    return decode(p);
  };
  // Every slot starts as black (all key bits 0), whose demand is computed here.
  const keys = memoKeys;
  const values = memoValues;
  keys.fill(0);
  values.fill(demand(0, 0, 0));
  let misses = 0;
  let i = 0;
  for (; i < n; i++) {
    if (i === MEMO_TRIAL && misses > MEMO_TRIAL / 2) break;
    const a = bits[i * 3];
    const b = bits[i * 3 + 1];
    const c = bits[i * 3 + 2];
    const slot = Math.imul(Math.imul(Math.imul(a, 0x9e3779b1) + b, 0x85ebca77) + c, 0xc2b2ae3d) >>> 20;
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

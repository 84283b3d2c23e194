import { REC601, REC709, srgbDecodeFast as srgbDecode, srgbEncodeFast as srgbEncode } from '../../color/srgb';
import type { PanelParams } from '../../model/parameters';
import type { CellRgb } from '../fit/fit';

/**
 * Tone: linear RGB per cell → drive demand in linear light (0–1). Luma by Rec. 709 on linear
 * light (or Rec. 601 on the encoded values), then in the perceptual (sRGB-encoded) domain:
 * contrast about 0.5, brightness offset, gamma exponent, invert, black clip; finally decoded
 * back to linear light, where levels and dithering work (so dithering keeps mean luminance).
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
  const [r601, g601, b601] = REC601;
  const [r709, g709, b709] = REC709;
  for (let i = 0; i < n; i++) {
    const R = data[i * 3];
    const G = data[i * 3 + 1];
    const B = data[i * 3 + 2];
    let p = rec601 ? r601 * encode(R) + g601 * encode(G) + b601 * encode(B) : encode(r709 * R + g709 * G + b709 * B);
    p = (p - 0.5) * contrast + 0.5 + brightness;
    p = Math.min(1, Math.max(0, p));
    if (gamma !== 1) p = p ** gamma;
    if (invert) p = 1 - p;
    p = p <= threshold ? 0 : (p - threshold) / (1 - threshold);
    result[i] = decode(p);
  }
  return result;
}

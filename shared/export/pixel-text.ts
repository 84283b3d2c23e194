import { EMBER_5X7 } from '../../fonts/ember-5x7';
import type { RgbaImage } from '../pipeline/types';

/** Glyph cell of Ember 5×7 in font pixels: 5 wide, 7 tall, one pixel apart. */
const GLYPH_W = 5;
const GLYPH_H = 7;
const ADVANCE = GLYPH_W + 1;

export type Rgb = readonly [number, number, number];

/** Characters the font draws as another: dashes as a hyphen, quotes as an apostrophe. */
const ALIASES: Readonly<Record<string, string>> = { '–': '-', '—': '-', '−': '-', '‘': "'", '’': "'", '“': "'", '”': "'", '"': "'" };

/** What a string shows in Ember 5×7: capitals (the font has no small letters), '?' for anything it lacks. */
export function printable(text: string): string {
  return [...text.toUpperCase()].map((ch) => ALIASES[ch] ?? (EMBER_5X7[ch] ? ch : '?')).join('');
}

/** Width in image pixels of `text` at `scale` image pixels per font pixel (no trailing gap). */
export function textWidth(text: string, scale: number): number {
  const n = [...printable(text)].length;
  return n ? (n * ADVANCE - 1) * scale : 0;
}

/** Height in image pixels of a line of text at `scale`. */
export const textHeight = (scale: number): number => GLYPH_H * scale;

/** `text` cut to at most `maxWidth` pixels at `scale`, ending in '..' when it had to be cut. */
export function fitText(text: string, scale: number, maxWidth: number): string {
  const chars = [...printable(text)];
  if (textWidth(chars.join(''), scale) <= maxWidth) return chars.join('');
  while (chars.length && textWidth(`${chars.join('')}..`, scale) > maxWidth) chars.pop();
  return chars.length ? `${chars.join('')}..` : '';
}

/** Paints `text` (capitals of Ember 5×7) into an opaque RGBA image with its top-left corner at x, y; clipped to the image. */
export function drawText(image: RgbaImage, text: string, x: number, y: number, scale: number, colour: Rgb): void {
  let cx = x;
  for (const ch of printable(text)) {
    const glyph = EMBER_5X7[ch];
    for (let gy = 0; gy < GLYPH_H; gy++) {
      for (let gx = 0; gx < GLYPH_W; gx++) {
        if (glyph[gy][gx] === '#') fillRect(image, cx + gx * scale, y + gy * scale, scale, scale, colour);
      }
    }
    cx += ADVANCE * scale;
  }
}

/** Fills a rectangle of an opaque RGBA image, clipped to the image (whole 32-bit pixels at a time). */
export function fillRect(image: RgbaImage, x: number, y: number, w: number, h: number, colour: Rgb): void {
  const x0 = Math.max(0, Math.floor(x));
  const y0 = Math.max(0, Math.floor(y));
  const x1 = Math.min(image.width, Math.floor(x + w));
  const y1 = Math.min(image.height, Math.floor(y + h));
  if (x1 <= x0 || y1 <= y0) return;
  const d = image.data;
  // The pixel's four bytes as one word in this machine's byte order.
  const word = new Uint32Array(Uint8Array.from([colour[0], colour[1], colour[2], 255]).buffer)[0];
  if (d.byteOffset % 4 === 0) {
    const words = new Uint32Array(d.buffer, d.byteOffset, d.length >> 2);
    for (let yy = y0; yy < y1; yy++) words.fill(word, yy * image.width + x0, yy * image.width + x1);
    return;
  }
  for (let yy = y0; yy < y1; yy++) {
    for (let xx = x0; xx < x1; xx++) d.set([colour[0], colour[1], colour[2], 255], (yy * image.width + xx) * 4);
  }
}

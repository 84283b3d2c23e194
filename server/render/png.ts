import zlib from 'node:zlib';
import { instantiate, kernelsEnabled, layout, reserve } from '@shared/pipeline/wasm';
import type { RgbaImage } from '@shared/pipeline/types';
import { PNG_WASM_BASE64 } from './png-wasm';

/**
 * PNG files of renders, written in row bands on the render pool's threads (the way pigz
 * compresses in parallel). Each band's scanlines — filter type 0, then RGB; renders are opaque —
 * are deflated on their own (zlib level 2), every band but the last ending on a sync flush so its
 * bytes end on a byte boundary, with the Adler-32 of its scanlines. The HTTP thread then joins the
 * bands into one zlib stream (header, the bands' deflate data in order, the Adler-32 of them all
 * combined) in one IDAT chunk. The file format: PNG (ISO/IEC 15948, W3C PNG 2nd edition); the
 * stream: RFC 1950 (zlib) and RFC 1951 (deflate). A band starts without the previous band's
 * window, which costs about a kilobyte a band; its pixels are the same.
 */

/** One band's deflate data and what joining it needs. */
export interface PngBand {
  /** Raw deflate data (RFC 1951): a sync flush at the end, or the final block for the last band. */
  deflated: Uint8Array;
  /** Adler-32 of the band's scanlines. */
  adler: number;
  /** Length of the band's scanlines in bytes. */
  length: number;
}

/**
 * zlib level 2: on the bench's render, a third of level 6's time for 1.5 × its size (24 vs 71 ms,
 * 795 vs 532 KiB); level 1 was hardly faster and 8 % larger.
 */
const LEVEL = 2;
const ADLER_BASE = 65521;

interface Exports {
  memory: WebAssembly.Memory;
  packRows(src: number, dst: number, width: number, rows: number): void;
  adler32(adler: number, p: number, len: number): number;
}
let loaded: Exports | null | undefined;
/** The kernels, or null where they cannot run (the loops below run instead). */
export const pngKernels = (): Exports | null => {
  if (!kernelsEnabled()) return null;
  if (loaded === undefined) loaded = instantiate<Exports>(PNG_WASM_BASE64);
  return loaded;
};

/** Bytes of PNG scanlines of `rows` rows `width` pixels wide (RGB, a filter byte a row). */
const scanlineBytes = (width: number, rows: number) => rows * (width * 3 + 1);

/** Rows y0 … y1 of an RGBA image as PNG scanlines (filter 0, RGB): the definition of png.wat's packRows. */
export function packRows(image: RgbaImage, y0: number, y1: number, out = new Uint8Array(scanlineBytes(image.width, y1 - y0))): Uint8Array {
  const { width, data } = image;
  let o = 0;
  for (let y = y0; y < y1; y++) {
    out[o++] = 0;
    for (let x = 0, i = y * width * 4; x < width; x++, i += 4) {
      out[o++] = data[i];
      out[o++] = data[i + 1];
      out[o++] = data[i + 2];
    }
  }
  return out;
}

/** Adler-32 (RFC 1950, section 8.2) of `bytes`, continuing from `adler`: the definition of png.wat's adler32. */
export function adler32(bytes: Uint8Array, adler = 1): number {
  let s1 = adler & 0xffff;
  let s2 = adler >>> 16;
  for (let i = 0; i < bytes.length;) {
    // The remainder every 5552 bytes, as zlib takes it (NMAX).
    const end = Math.min(bytes.length, i + 5552);
    for (; i < end; i++) {
      s1 += bytes[i];
      s2 += s1;
    }
    s1 %= ADLER_BASE;
    s2 %= ADLER_BASE;
  }
  return ((s2 << 16) | s1) >>> 0;
}

/** The Adler-32 of A followed by B from the Adler-32 of each and B's length (zlib's adler32_combine). */
export function adler32Combine(a: number, b: number, lengthB: number): number {
  const rem = lengthB % ADLER_BASE;
  let s1 = a & 0xffff;
  let s2 = (rem * s1) % ADLER_BASE;
  s1 += (b & 0xffff) + ADLER_BASE - 1;
  s2 += (a >>> 16) + (b >>> 16) + ADLER_BASE - rem;
  if (s1 >= ADLER_BASE) s1 -= ADLER_BASE;
  if (s1 >= ADLER_BASE) s1 -= ADLER_BASE;
  if (s2 >= 2 * ADLER_BASE) s2 -= 2 * ADLER_BASE;
  if (s2 >= ADLER_BASE) s2 -= ADLER_BASE;
  return ((s2 << 16) | s1) >>> 0;
}

/** Where a band of `rows` RGBA rows and its scanlines lie in the kernels' memory. */
const bandLayout = (width: number, rows: number) =>
  // The packed rows' 16-byte stores run up to 4 bytes past the end.
  layout({ rgba: width * 4 * rows, scanlines: scanlineBytes(width, rows) + 4 });

/**
 * An RGBA buffer for a band of `rows` rows `width` pixels wide, in the kernels' memory where they
 * run: fill it (compose writes its rows there), then deflateRgba packs it where it lies, with no
 * copy. Valid until the next call on this thread.
 */
export function bandBuffer(width: number, rows: number): RgbaImage {
  const k = pngKernels();
  if (!k) return { width, height: rows, data: new Uint8Array(width * 4 * rows) };
  const { at, end } = bandLayout(width, rows);
  return { width, height: rows, data: new Uint8Array(reserve(k.memory, end), at.rgba, width * 4 * rows) };
}

/** An RGBA image's scanlines and their Adler-32, through the kernels where they run. */
function scanlines(image: RgbaImage): { bytes: Uint8Array; adler: number } {
  const k = pngKernels();
  if (!k) {
    const bytes = packRows(image, 0, image.height);
    return { bytes, adler: adler32(bytes) };
  }
  const { width, height } = image;
  const { at, end } = bandLayout(width, height);
  const buffer = reserve(k.memory, end);
  const rgba = new Uint8Array(buffer, at.rgba, width * 4 * height);
  // A bandBuffer is packed where it lies; any other image is copied in first.
  if (image.data.buffer !== buffer || image.data.byteOffset !== at.rgba) rgba.set(image.data.subarray(0, rgba.length));
  const length = scanlineBytes(width, height);
  k.packRows(at.rgba, at.scanlines, width, height);
  return { bytes: new Uint8Array(buffer, at.scanlines, length), adler: k.adler32(1, at.scanlines, length) >>> 0 };
}

/** An opaque RGBA image (or bandBuffer) deflated as one band of a PNG file; `last` for the band that ends the image. */
export function deflateRgba(image: RgbaImage, last: boolean): PngBand {
  const { bytes, adler } = scanlines(image);
  const deflated = zlib.deflateRawSync(bytes, {
    level: LEVEL,
    finishFlush: last ? zlib.constants.Z_FINISH : zlib.constants.Z_SYNC_FLUSH,
    // Output pieces near an eighth of the input (renders deflate to a tenth or so) instead of
    // 16 KiB ones: fewer trips through zlib and one short join (about 1 ms a 1920 × 720 band).
    chunkSize: Math.max(zlib.constants.Z_DEFAULT_CHUNK, Math.min(1 << 18, bytes.length >> 3)),
  });
  return { deflated, adler, length: bytes.length };
}

/** Rows y0 … y1 of an opaque RGBA image deflated as one band of a PNG file; `last` for the band that ends the image. */
export function deflateBand(image: RgbaImage, y0: number, y1: number, last: boolean): PngBand {
  const rows = { width: image.width, height: y1 - y0, data: image.data.subarray(image.width * 4 * y0, image.width * 4 * y1) };
  return deflateRgba(rows, last);
}

/**
 * PNG chunks, each a type and the pieces of its data, written after `lead` into one buffer: length,
 * type, data and the CRC-32 of type and data (PNG specification, section 5.3). One allocation
 * and one copy of each piece, however many pieces a chunk has.
 */
function writeChunks(lead: Uint8Array, chunks: readonly (readonly [string, readonly Uint8Array[]])[]): Buffer {
  let size = lead.length;
  for (const [, parts] of chunks) for (const part of parts) size += part.length;
  const out = Buffer.allocUnsafe(size + 12 * chunks.length);
  out.set(lead, 0);
  let o = lead.length;
  for (const [type, parts] of chunks) {
    const start = o;
    out.write(type, start + 4, 'latin1');
    o += 8;
    for (const part of parts) {
      out.set(part, o);
      o += part.length;
    }
    out.writeUInt32BE(o - start - 8, start);
    out.writeUInt32BE(zlib.crc32(out.subarray(start + 4, o)) >>> 0, o);
    o += 4;
  }
  return out;
}

/** One PNG chunk: length, type, data and the CRC-32 of type and data (PNG specification, section 5.3). */
export function pngChunk(type: string, data: Uint8Array): Buffer {
  return writeChunks(new Uint8Array(0), [[type, [data]]]);
}

/** The eight bytes every PNG file starts with. */
export const PNG_SIGNATURE = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
/** zlib header: deflate, 32 KiB window, "fast" level; (0x78 · 256 + 0x5e) is a multiple of 31. */
const ZLIB_HEADER = Buffer.from([0x78, 0x5e]);

/** The PNG file of an opaque RGB image from its bands, top to bottom: the bands' data copied once, into the file. */
export function joinPng(width: number, height: number, bands: readonly PngBand[]): Buffer {
  const header = Buffer.alloc(13);
  header.writeUInt32BE(width, 0);
  header.writeUInt32BE(height, 4);
  // 8 bits a sample, colour type 2 (RGB), deflate, adaptive filtering method 0, no interlace.
  header.set([8, 2, 0, 0, 0], 8);
  let adler = 1;
  for (const b of bands) adler = adler32Combine(adler, b.adler, b.length);
  const trailer = Buffer.alloc(4);
  trailer.writeUInt32BE(adler, 0);
  return writeChunks(PNG_SIGNATURE, [
    ['IHDR', [header]],
    ['IDAT', [ZLIB_HEADER, ...bands.map((b) => b.deflated), trailer]],
    ['IEND', []],
  ]);
}

/** An opaque RGBA image as a PNG file, in one band on this thread (single-thread renders and tests). */
export function renderPng(image: RgbaImage): Buffer {
  return joinPng(image.width, image.height, [deflateBand(image, 0, image.height, true)]);
}

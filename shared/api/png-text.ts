/**
 * Text in a PNG file: iTXt chunks (PNG 1.2 / ISO/IEC 15948 §11.3.4 — UTF-8 text under a Latin-1
 * keyword), inserted right after IHDR so any reader finds them before the image data.
 */

const CRC_TABLE = Uint32Array.from({ length: 256 }, (_, n) => {
  let c = n;
  for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
  return c >>> 0;
});

/** CRC-32 as PNG computes it over a chunk's type and data (ISO 3309, polynomial 0xEDB88320). */
export function crc32(bytes: Uint8Array): number {
  let c = 0xffffffff;
  for (const b of bytes) c = CRC_TABLE[(c ^ b) & 0xff] ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}

const SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];

/** One uncompressed iTXt chunk: keyword (1–79 Latin-1 characters), no language tag, UTF-8 text. */
function itxtChunk(keyword: string, text: string): Uint8Array {
  if (!/^[\x20-\x7e\xa1-\xff]{1,79}$/.test(keyword))
    throw new RangeError(`a PNG text keyword is 1 to 79 Latin-1 characters, got "${keyword}"`);
  const utf8 = new TextEncoder().encode(text);
  const data = new Uint8Array(keyword.length + 5 + utf8.length);
  for (let i = 0; i < keyword.length; i++) data[i] = keyword.charCodeAt(i);
  // After the keyword's NUL: compression flag 0, method 0, empty language tag, empty translated keyword.
  data.set(utf8, keyword.length + 5);
  const typed = new Uint8Array(4 + data.length);
  typed.set([0x69, 0x54, 0x58, 0x74]); // "iTXt"
  typed.set(data, 4);
  const chunk = new Uint8Array(12 + data.length);
  const view = new DataView(chunk.buffer);
  view.setUint32(0, data.length);
  chunk.set(typed, 4);
  view.setUint32(8 + data.length, crc32(typed));
  return chunk;
}

/** The PNG with one iTXt chunk per entry after its IHDR; throws on bytes that are not a PNG. */
export function withPngText(png: Uint8Array, entries: Readonly<Record<string, string>>): Uint8Array<ArrayBuffer> {
  if (png.length < 33 || SIGNATURE.some((b, i) => png[i] !== b)) throw new RangeError('not a PNG file');
  const ihdrEnd = 8 + 12 + new DataView(png.buffer, png.byteOffset).getUint32(8);
  const chunks = Object.entries(entries).map(([k, v]) => itxtChunk(k, v));
  const out = new Uint8Array(png.length + chunks.reduce((n, c) => n + c.length, 0));
  out.set(png.subarray(0, ihdrEnd));
  let at = ihdrEnd;
  for (const c of chunks) {
    out.set(c, at);
    at += c.length;
  }
  out.set(png.subarray(ihdrEnd), at);
  return out;
}

/** The iTXt entries of a PNG, keyword → text (for tests and imports). */
export function readPngText(png: Uint8Array): Record<string, string> {
  const view = new DataView(png.buffer, png.byteOffset, png.byteLength);
  const found: Record<string, string> = {};
  for (let at = 8; at + 12 <= png.length;) {
    const length = view.getUint32(at);
    const type = String.fromCharCode(...png.subarray(at + 4, at + 8));
    if (type === 'iTXt') {
      const data = png.subarray(at + 8, at + 8 + length);
      const nul = data.indexOf(0);
      const keyword = String.fromCharCode(...data.subarray(0, nul));
      // Skip flag, method, and the two NUL-terminated fields that follow.
      let p = nul + 3;
      p = data.indexOf(0, p) + 1;
      p = data.indexOf(0, p) + 1;
      found[keyword] = new TextDecoder().decode(data.subarray(p));
    }
    at += 12 + length;
  }
  return found;
}

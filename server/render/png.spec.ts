import zlib from 'node:zlib';
import { PNG } from 'pngjs';
import sharp from 'sharp';
import { bothWays, firstDifference } from '@shared/testing/kernels';
import type { RgbaImage } from '@shared/pipeline/types';
import { adler32, adler32Combine, bandBuffer, deflateBand, deflateRgba, joinPng, packRows, pngKernels, renderPng } from './png';

/**
 * The render PNG writer (png.ts): checked against general-purpose libraries — zlib's own
 * Adler-32 (the trailer of a zlib stream, RFC 1950), zlib's inflate (which verifies that
 * checksum), pngjs (which verifies every chunk's CRC-32) and sharp (libpng).
 */

/** Seeded bytes, so runs repeat. */
function bytesOf(length: number, seed: number): Uint8Array {
  let s = seed;
  return Uint8Array.from({ length }, () => (s = (s * 1103515245 + 12345) % 2147483648) >>> 23);
}

/** An opaque RGBA image whose channels vary along both axes (and a noisy stretch that deflates poorly). */
function imageOf(width: number, height: number, seed = 7): RgbaImage {
  const noise = bytesOf(width * height, seed);
  const data = new Uint8Array(width * height * 4);
  for (let y = 0; y < height; y++)
    for (let x = 0; x < width; x++) {
      const i = (y * width + x) * 4;
      data.set([(x * 7 + y) & 255, (y * 3) & 255, y > height / 2 ? noise[y * width + x] : (x ^ y) & 255, 255], i);
    }
  return { width, height, data };
}

/** zlib's Adler-32 of `bytes`: the last four bytes of its zlib stream (level 0: stored, quick). */
const zlibAdler = (bytes: Uint8Array) => {
  const stream = zlib.deflateSync(bytes, { level: 0 });
  return stream.readUInt32BE(stream.length - 4);
};

/** The image's RGB bytes, row after row. */
const rgbOf = (image: RgbaImage) => Buffer.from(image.data.filter((_, i) => i % 4 !== 3));

describe('Adler-32 (RFC 1950, section 8.2) against zlib', () => {
  // Lengths around the 16-byte steps and the 5552-byte blocks, and all-255 bytes: the largest sums.
  const cases: [string, Uint8Array][] = [
    ...[0, 1, 15, 16, 17, 31, 5551, 5552, 5553, 5552 * 3 + 7, 100_003].map((n): [string, Uint8Array] => [
      `${n} seeded bytes`,
      bytesOf(n, n + 1),
    ]),
    ['1 MiB of 255', new Uint8Array(1 << 20).fill(255)],
    ['65 536 bytes of 1', new Uint8Array(65_536).fill(1)],
  ];
  test.each(cases)('%s: the loop gives zlib’s checksum', (_name, bytes) => {
    expect(adler32(bytes)).toBe(zlibAdler(bytes));
  });

  test('combining the checksums of two parts gives the checksum of the whole (zlib’s adler32_combine)', () => {
    const bytes = bytesOf(200_000, 3);
    for (const cut of [0, 1, 5552, 65_521, 65_522, 131_042, 199_999, 200_000]) {
      const a = adler32(bytes.subarray(0, cut));
      const b = adler32(bytes.subarray(cut));
      expect({ cut, adler: adler32Combine(a, b, bytes.length - cut) }).toEqual({ cut, adler: zlibAdler(bytes) });
    }
  });
});

describe('scanlines', () => {
  test('this Node.js runs the kernels (so the comparisons with the loops compare two things)', () => {
    expect(pngKernels()).not.toBeNull();
  });

  // Widths with 0–3 pixels after the last four, and bands longer than one 5552-byte block.
  test.each([1, 2, 3, 4, 5, 7, 64, 641])('width %i: the kernel packs the same bytes as the loop, and its checksum is zlib’s', (width) => {
    const image = imageOf(width, 9);
    const { kernels, loops } = bothWays(() => {
      const band = deflateBand(image, 2, 9, true);
      return { band, bytes: zlib.inflateRawSync(band.deflated) };
    });
    const want = packRows(image, 2, 9);
    expect(firstDifference(kernels.bytes, want)).toBe('same');
    expect(firstDifference(loops.bytes, want)).toBe('same');
    expect(kernels.band.adler).toBe(zlibAdler(want));
    expect(loops.band.adler).toBe(zlibAdler(want));
    // Filter type 0, then the RGB of each pixel.
    expect([...want.subarray(0, 4)]).toEqual([0, ...image.data.subarray(2 * width * 4, 2 * width * 4 + 3)]);
  });

  test('a white band (the largest sums, 1.2 MB) has zlib’s checksum through the kernel and the loop', () => {
    const white: RgbaImage = { width: 2000, height: 200, data: new Uint8Array(2000 * 200 * 4).fill(255) };
    const want = zlibAdler(packRows(white, 0, 200));
    const { kernels, loops } = bothWays(() => deflateBand(white, 0, 200, true).adler);
    expect({ kernels, loops }).toEqual({ kernels: want, loops: want });
  });
});

describe('a PNG joined from bands', () => {
  const image = imageOf(333, 201);
  const bandsOf = (count: number) =>
    Array.from({ length: count }, (_, i) => {
      const y0 = Math.floor((i * image.height) / count);
      const y1 = Math.floor(((i + 1) * image.height) / count);
      return deflateBand(image, y0, y1, i === count - 1);
    });

  test.each([1, 2, 3, 7])('%i band(s): pngjs (checking every CRC) and sharp read back the same RGB pixels', async (count) => {
    const png = count === 1 ? renderPng(image) : joinPng(image.width, image.height, bandsOf(count));
    const read = PNG.sync.read(png, { checkCRC: true } as never);
    expect([read.width, read.height]).toEqual([image.width, image.height]);
    expect(firstDifference(read.data, image.data)).toBe('same');
    const { data, info } = await sharp(png).raw().toBuffer({ resolveWithObject: true });
    expect(info.channels).toBe(3);
    expect(firstDifference(data, rgbOf(image))).toBe('same');
  });

  test('a band filled in the writer’s own buffer (as the pool composes into it) is packed where it lies, to the same bytes as a copy', () => {
    const band = bandBuffer(image.width, 50);
    band.data.set(image.data.subarray(0, image.width * 4 * 50));
    expect(band.data.buffer).toBe(pngKernels()!.memory.buffer);
    const inPlace = deflateRgba(band, true);
    const copied = deflateBand(image, 0, 50, true);
    expect({ ...inPlace, deflated: Buffer.from(inPlace.deflated).toString('base64') }).toEqual({
      ...copied,
      deflated: Buffer.from(copied.deflated).toString('base64'),
    });
  });

  test('the IDAT data is one zlib stream whose checksum zlib’s inflate accepts', () => {
    const png = joinPng(image.width, image.height, bandsOf(3));
    // Signature 8, IHDR 25, then the IDAT chunk: length, type, data.
    const length = png.readUInt32BE(33);
    expect(png.toString('latin1', 37, 41)).toBe('IDAT');
    const scanlines = zlib.inflateSync(png.subarray(41, 41 + length));
    expect(firstDifference(scanlines, packRows(image, 0, image.height))).toBe('same');
  });
});

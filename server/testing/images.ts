import { crc32, deflateSync } from 'node:zlib';

/** An RGBA PNG from a pixel function (pngjs, independent of sharp); the demo seed uses it too. */
export { pngOf } from '../render/png-of';

/** One PNG chunk: length, type, data and its CRC-32 (PNG specification, section 5.3). */
export function pngChunk(type: string, data: Buffer): Buffer {
  const len = Buffer.alloc(4);
  len.writeUInt32BE(data.length);
  const body = Buffer.concat([Buffer.from(type, 'latin1'), data]);
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(crc32(body) >>> 0);
  return Buffer.concat([len, body, crc]);
}

/** A PNG whose header claims width × height but whose data is tiny: a pixel bomb. */
export function pngBomb(width: number, height: number): Buffer {
  const chunk = pngChunk;
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(width, 0);
  ihdr.writeUInt32BE(height, 4);
  ihdr.set([1, 0, 0, 0, 0], 8); // 1-bit grayscale
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    chunk('IHDR', ihdr),
    chunk('IDAT', deflateSync(Buffer.alloc(64))),
    chunk('IEND', Buffer.alloc(0)),
  ]);
}
